/** Tool version, recorded with every run (cache keys and provenance use it). */
export const VERSION = "0.2.0";
