/**
 * Unit handling at the ingest boundary. A column header declares its unit once
 * (`length [mi]`); the column's conversion factor to the internal unit is resolved
 * here once per file, so rows are converted with one multiplication.
 */
import * as math from "mathjs";

let unitsRegistered = false;

/** Adds reactive-power units (var, kvar, Mvar) to mathjs. Idempotent. */
function registerUnits(): void {
  if (unitsRegistered) return;
  unitsRegistered = true;
  math.createUnit({
    var: { definition: "1 VA", prefixes: "short", aliases: ["VAr"] },
    kft: { definition: "1000 ft" },
  }, { override: false });
}

/** Internal unit of a quantity column, and the kind of power it holds where that matters. */
export type InternalUnit =
  | "km"
  | "m"
  | "mm"
  | "kV"
  | "kW"
  | "kvar"
  | "kVA"
  | "MVA"
  | "A"
  | "ohm"
  | "ohm/km"
  | "uS/km"
  | "nF/km"
  | "s"
  | "Hz"
  | "ohm m"
  | "deg"
  | "pu"
  | "%";

/** mathjs names of the internal units (kvar converts through VA). */
const MATHJS_NAME: Record<Exclude<InternalUnit, "pu" | "%">, string> = {
  km: "km",
  m: "m",
  mm: "mm",
  kV: "kV",
  kW: "kW",
  kvar: "kvar",
  kVA: "kVA",
  MVA: "MVA",
  A: "A",
  ohm: "ohm",
  "ohm/km": "ohm/km",
  "uS/km": "uS/km",
  "nF/km": "nF/km",
  s: "s",
  Hz: "Hz",
  "ohm m": "ohm m",
  deg: "deg",
};

export type UnitResolution =
  | { readonly ok: true; readonly factor: number }
  | {
    readonly ok: false;
    readonly code: "unit.unknown" | "unit.dimension";
    readonly message: string;
  };

/** Rewrites the spellings users type into ones mathjs reads: Ω → ohm, µ → u, · → space. */
export function normalizeUnitText(text: string): string {
  return text
    .trim()
    .replace(/[\u03A9\u2126]/g, "ohm")
    .replace(/[\u00B5\u03BC]/g, "u")
    .replace(/[\u00B7\u22C5*]/g, " ")
    .replace(/\u00B2/g, "^2")
    .replace(/\u00B0/g, "deg")
    .replace(/\s+/g, " ")
    // Reactive power in any capitalisation (kVAR, MVAr, var): our var unit. mathjs has a
    // complex-valued VAR of its own that does not convert to a plain number.
    .replace(/(^|[^A-Za-z])([kMGm]?)var(?=$|[^A-Za-z])/gi, "$1$2var");
}

const DIMENSIONLESS: Readonly<Record<"pu" | "%", ReadonlyMap<string, number>>> = {
  pu: new Map([["pu", 1], ["p.u.", 1], ["%", 0.01]]),
  "%": new Map([["%", 1], ["pu", 100], ["p.u.", 100]]),
};

/**
 * Resolves the factor that converts a value in `unitText` to `internal`.
 * Power columns also check the kind of power: an active-power column takes W-type units,
 * a reactive one var-type, an apparent one VA-type (mathjs treats all three as watts).
 */
export function resolveUnit(unitText: string, internal: InternalUnit): UnitResolution {
  registerUnits();
  const text = normalizeUnitText(unitText);
  if (internal === "pu" || internal === "%") {
    const factor = DIMENSIONLESS[internal].get(text);
    if (factor === undefined) {
      return {
        ok: false,
        code: "unit.dimension",
        message: `unit "${unitText}" is not a ratio; expected pu or %`,
      };
    }
    return { ok: true, factor };
  }
  if (DIMENSIONLESS.pu.has(text)) {
    return {
      ok: false,
      code: "unit.dimension",
      message: `unit "${unitText}" is a ratio; expected a unit convertible to ${internal}`,
    };
  }
  // A number in the unit text ("1e3 m", "2 km") would be dropped by mathjs: refuse it.
  // Digits are allowed only as exponents ("mm^2").
  if (/(^|[^^\d])\d/.test(text.replace(/\^-?\d+/g, ""))) {
    return {
      ok: false,
      code: "unit.unknown",
      message: `unit "${unitText}" holds a number; give the unit alone, e.g. [m]`,
    };
  }
  let parsed: math.Unit;
  try {
    parsed = math.unit(1, text);
  } catch {
    return { ok: false, code: "unit.unknown", message: `unit "${unitText}" is not a known unit` };
  }
  const target = math.unit(1, MATHJS_NAME[internal]);
  if (!parsed.equalBase(target) || !powerKindMatches(text, internal)) {
    return {
      ok: false,
      code: "unit.dimension",
      message: `unit "${unitText}" cannot be converted to ${internal}`,
    };
  }
  let factor: number;
  try {
    factor = parsed.toNumber(MATHJS_NAME[internal]);
  } catch {
    return { ok: false, code: "unit.unknown", message: `unit "${unitText}" has no usable scale` };
  }
  if (!Number.isFinite(factor) || factor <= 0) {
    return { ok: false, code: "unit.unknown", message: `unit "${unitText}" has no usable scale` };
  }
  return { ok: true, factor };
}

function powerKindMatches(text: string, internal: InternalUnit): boolean {
  if (internal === "kvar") return /var$/i.test(text);
  if (internal === "kVA" || internal === "MVA") return /VA$/.test(text);
  if (internal === "kW") return /W$/.test(text);
  return true;
}
