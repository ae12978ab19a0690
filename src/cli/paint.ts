/** Terminal colour: only on a TTY, never when NO_COLOR is set (https://no-color.org). */

export interface Paint {
  readonly red: (s: string) => string;
  readonly yellow: (s: string) => string;
  readonly green: (s: string) => string;
  readonly dim: (s: string) => string;
  readonly bold: (s: string) => string;
}

const plain = (s: string) => s;
const sgr = (code: string) => (s: string) => `\x1b[${code}m${s}\x1b[0m`;

export const NO_PAINT: Paint = { red: plain, yellow: plain, green: plain, dim: plain, bold: plain };
const ANSI: Paint = {
  red: sgr("31"),
  yellow: sgr("33"),
  green: sgr("32"),
  dim: sgr("2"),
  bold: sgr("1"),
};

/** Chooses colour for a stream from whether it is a terminal and the environment. */
export function choosePaint(isTerminal: boolean, noColor: string | undefined): Paint {
  return isTerminal && (noColor === undefined || noColor === "") ? ANSI : NO_PAINT;
}
