/**
 * Numbers as text for the report, the same on every machine (no locale): fixed decimals,
 * thousands grouped with a comma, "–" for an unknown value.
 */

export const UNKNOWN = "–";

/** `v` with `digits` decimals and grouped thousands; "–" for null or a non-finite value. */
export function formatNumber(v: number | null | undefined, digits = 0): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return UNKNOWN;
  let s = v.toFixed(digits);
  if (/^-0(\.0*)?$/.test(s)) s = s.slice(1);
  const [whole, frac] = s.split(".");
  const grouped = whole!.replace(/\B(?=(\d{3})+(?!\d))/g, ",");
  return frac === undefined ? grouped : `${grouped}.${frac}`;
}

/**
 * An amount of money: whole units from 1,000 up, below that at most two decimals with
 * trailing zeros dropped (costs in thousands are small numbers): "NVC 12,400", "k-NVK 4.4".
 */
export function formatMoney(v: number | null | undefined, currency: string): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return UNKNOWN;
  const n = Math.abs(v) >= 1000 ? formatNumber(v, 0) : formatNumber(v, 2).replace(/\.?0+$/, "");
  return `${currency} ${n}`;
}
