/** Diagnostics are data: every problem found anywhere in the pipeline becomes one of these. */

export type Severity = "error" | "warning" | "info";

/** Where a problem was found. Line and column are 1-based; column is the CSV field number. */
export interface SourceLocation {
  readonly file: string;
  readonly line?: number;
  readonly column?: number;
  readonly field?: string;
}

export interface Diagnostic {
  /** Stable code of our own, e.g. `unit.unknown`; see docs/diagnostics.md. */
  readonly code: string;
  readonly severity: Severity;
  readonly message: string;
  readonly at?: SourceLocation;
  readonly feederId?: string;
  /** The offending value as found in the input, when there is one. */
  readonly found?: string;
  /** What was expected instead, in words. */
  readonly expected?: string;
}

/** Builds a diagnostic, leaving optional keys out instead of setting them to undefined. */
export function makeDiagnostic(
  code: string,
  severity: Severity,
  message: string,
  extra: {
    at?: SourceLocation | undefined;
    feederId?: string | undefined;
    found?: string | undefined;
    expected?: string | undefined;
  } = {},
): Diagnostic {
  const d: { -readonly [K in keyof Diagnostic]: Diagnostic[K] } = { code, severity, message };
  if (extra.at !== undefined) d.at = extra.at;
  if (extra.feederId !== undefined) d.feederId = extra.feederId;
  if (extra.found !== undefined) d.found = extra.found;
  if (extra.expected !== undefined) d.expected = extra.expected;
  return d;
}

/** Orders diagnostics by file, line, column, then code, for stable output. */
export function compareDiagnostics(a: Diagnostic, b: Diagnostic): number {
  const fa = a.at?.file ?? "", fb = b.at?.file ?? "";
  if (fa !== fb) return fa < fb ? -1 : 1;
  const la = a.at?.line ?? 0, lb = b.at?.line ?? 0;
  if (la !== lb) return la - lb;
  const ca = a.at?.column ?? 0, cb = b.at?.column ?? 0;
  if (ca !== cb) return ca - cb;
  if (a.code !== b.code) return a.code < b.code ? -1 : 1;
  return a.message < b.message ? -1 : a.message > b.message ? 1 : 0;
}
