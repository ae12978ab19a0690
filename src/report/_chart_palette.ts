/**
 * Colours of the report's charts, a palette of our own: muted, distinct in print and for
 * the common colour-vision deficiencies when read with the dash patterns and labels.
 */
export const SERIES_COLOURS: readonly string[] = [
  "#2f5d8a", // slate blue
  "#c06a2b", // burnt orange
  "#4f7d3a", // moss
  "#7b4a86", // plum
  "#9a7b1c", // ochre
  "#3d7f80", // teal
  "#8a3b3b", // brick
  "#5b6470", // slate grey
];

/** The one colour of single-series charts. */
export const BAR_COLOUR = "#3f6286";

/** Band-limit rules and their labels. */
export const LIMIT_COLOUR = "#8a3b3b";
