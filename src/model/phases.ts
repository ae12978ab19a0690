/** Phase sets as bitmasks: A = 1, B = 2, C = 4; ABC = 7. */

export const PHASE_A = 1;
export const PHASE_B = 2;
export const PHASE_C = 4;
export const PHASES_ABC = 7;

/** Bitmask of phase letters ("CA" → 5). Letters other than A, B, C are ignored. */
export function phaseMask(letters: string): number {
  let m = 0;
  for (const ch of letters.toUpperCase()) {
    m |= ch === "A" ? PHASE_A : ch === "B" ? PHASE_B : ch === "C" ? PHASE_C : 0;
  }
  return m;
}

/** Letters of a bitmask in A, B, C order (5 → "AC"). */
export function phaseLetters(mask: number): string {
  return (mask & PHASE_A ? "A" : "") + (mask & PHASE_B ? "B" : "") + (mask & PHASE_C ? "C" : "");
}

/** True when every phase of `inner` is in `outer`. */
export function phasesWithin(inner: number, outer: number): boolean {
  return (inner & ~outer) === 0;
}

/** Number of phases in a mask. */
export function phaseCount(mask: number): number {
  return (mask & 1) + ((mask >> 1) & 1) + ((mask >> 2) & 1);
}
