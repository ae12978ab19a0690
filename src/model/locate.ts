/** Locating a field of an input row, for diagnostics raised after ingest. */
import type { SourceLocation } from "./diagnostic.ts";

/** The location of `field` on the row at `at`, with its CSV column where the header has it. */
export function locateField(
  headers: Readonly<Record<string, readonly string[]>>,
  at: SourceLocation,
  field: string,
): SourceLocation {
  const idx = headers[at.file]?.indexOf(field) ?? -1;
  const loc: { -readonly [K in keyof SourceLocation]: SourceLocation[K] } = {
    file: at.file,
    field,
  };
  if (at.line !== undefined) loc.line = at.line;
  if (idx >= 0) loc.column = idx + 1;
  return loc;
}
