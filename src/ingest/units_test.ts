import { deepStrictEqual, equal, ok as assert } from "node:assert/strict";
import { type InternalUnit, normalizeUnitText, resolveUnit } from "./units.ts";

/** Conversion factors are exact or nearly so: 1e-12 relative to the expected factor. */
const REL_TOL = 1e-12;

// Sources used below:
// [SI-prefix] NIST, "SI prefixes" (physics.nist.gov/cuu/Units/prefixes.html): k = 1e3,
//   M = 1e6, m = 1e-3, µ = 1e-6, n = 1e-9, exact powers of ten.
// [1959] International yard and pound agreement (1959): 1 yd = 0.9144 m exactly, hence
//   1 ft = 0.3048 m and 1 mi = 1760 yd = 1609.344 m exactly (also NIST Handbook 44,
//   Appendix C [memory]).
// [IEC 80000-6] var is the name for the volt-ampere when used for reactive power; VA for
//   apparent power; W for active power [memory].
// [SI-derived] BIPM SI Brochure, 9th ed.: S = Ω⁻¹, Hz = s⁻¹, % = 0.01, 1° = π/180 rad
//   [memory].
const MI_KM = 1.609344; // [1959]
const FT_M = 0.3048; // [1959]

interface ConversionCase {
  readonly text: string;
  readonly internal: InternalUnit;
  readonly factor: number;
  readonly source: string;
}

const CONVERSIONS: readonly ConversionCase[] = [
  // Length.
  { text: "m", internal: "km", factor: 1e-3, source: "SI-prefix k = 1e3" },
  { text: "km", internal: "km", factor: 1, source: "identity" },
  { text: "mi", internal: "km", factor: MI_KM, source: "1959: 1 mi = 1.609344 km exactly" },
  { text: "ft", internal: "km", factor: FT_M / 1000, source: "1959: 1 ft = 0.3048 m exactly" },
  { text: "ft", internal: "m", factor: FT_M, source: "1959: 1 ft = 0.3048 m exactly" },
  { text: "in", internal: "mm", factor: 25.4, source: "1959: 1 in = 25.4 mm exactly" },
  { text: "cm", internal: "mm", factor: 10, source: "SI-prefix c = 1e-2, m = 1e-3" },
  // Series impedance per length.
  { text: "ohm/mi", internal: "ohm/km", factor: 1 / MI_KM, source: "1959 mile" },
  { text: "Ω/km", internal: "ohm/km", factor: 1, source: "Ω is the ohm symbol (SI-derived)" },
  { text: "Ω/mi", internal: "ohm/km", factor: 1 / MI_KM, source: "1959 mile" },
  { text: "ohm/ft", internal: "ohm/km", factor: 1000 / FT_M, source: "1959 foot" },
  // 1 mΩ/m = 1e-3 Ω / 1e-3 km = 1 Ω/km.
  { text: "mΩ/m", internal: "ohm/km", factor: 1, source: "SI-prefix m = 1e-3" },
  { text: "mohm/m", internal: "ohm/km", factor: 1, source: "SI-prefix m = 1e-3" },
  // Shunt susceptance and capacitance per length.
  { text: "µS/km", internal: "uS/km", factor: 1, source: "µ (U+00B5 micro sign), SI-prefix" },
  { text: "μS/km", internal: "uS/km", factor: 1, source: "μ (U+03BC Greek mu), SI-prefix" },
  { text: "S/km", internal: "uS/km", factor: 1e6, source: "SI-prefix µ = 1e-6" },
  { text: "uS/mi", internal: "uS/km", factor: 1 / MI_KM, source: "1959 mile" },
  { text: "uF/km", internal: "nF/km", factor: 1e3, source: "SI-prefix µ = 1e-6, n = 1e-9" },
  { text: "µF/km", internal: "nF/km", factor: 1e3, source: "SI-prefix µ = 1e-6, n = 1e-9" },
  { text: "nF/km", internal: "nF/km", factor: 1, source: "identity" },
  // Active power.
  { text: "MW", internal: "kW", factor: 1e3, source: "SI-prefix M = 1e6, k = 1e3" },
  { text: "W", internal: "kW", factor: 1e-3, source: "SI-prefix k = 1e3" },
  { text: "kW", internal: "kW", factor: 1, source: "identity" },
  { text: "GW", internal: "kW", factor: 1e6, source: "SI-prefix G = 1e9" },
  // Reactive power.
  { text: "Mvar", internal: "kvar", factor: 1e3, source: "IEC 80000-6 var + SI-prefix M" },
  { text: "var", internal: "kvar", factor: 1e-3, source: "IEC 80000-6 var + SI-prefix k" },
  { text: "kvar", internal: "kvar", factor: 1, source: "identity" },
  { text: "kVAr", internal: "kvar", factor: 1, source: "common practice spelling of kvar" },
  { text: "MVAr", internal: "kvar", factor: 1e3, source: "common practice spelling of Mvar" },
  // Apparent power.
  { text: "kVA", internal: "kVA", factor: 1, source: "identity" },
  { text: "MVA", internal: "kVA", factor: 1e3, source: "SI-prefix M = 1e6, k = 1e3" },
  { text: "kVA", internal: "MVA", factor: 1e-3, source: "SI-prefix M = 1e6, k = 1e3" },
  { text: "VA", internal: "MVA", factor: 1e-6, source: "SI-prefix M = 1e6" },
  // Current, voltage, impedance, time, frequency, angle, resistivity.
  { text: "kA", internal: "A", factor: 1e3, source: "SI-prefix k = 1e3" },
  { text: "A", internal: "A", factor: 1, source: "identity" },
  { text: "V", internal: "kV", factor: 1e-3, source: "SI-prefix k = 1e3" },
  { text: "kV", internal: "kV", factor: 1, source: "identity" },
  { text: "\u03A9", internal: "ohm", factor: 1, source: "Ω (U+03A9) is the ohm symbol" },
  { text: "\u2126", internal: "ohm", factor: 1, source: "U+2126 OHM SIGN" },
  { text: "mohm", internal: "ohm", factor: 1e-3, source: "SI-prefix m = 1e-3" },
  { text: "ms", internal: "s", factor: 1e-3, source: "SI-prefix m = 1e-3" },
  { text: "s", internal: "s", factor: 1, source: "identity" },
  { text: "Hz", internal: "Hz", factor: 1, source: "identity" },
  { text: "kHz", internal: "Hz", factor: 1e3, source: "SI-prefix k = 1e3" },
  { text: "rad", internal: "deg", factor: 180 / Math.PI, source: "SI-derived 1° = π/180 rad" },
  { text: "\u00B0", internal: "deg", factor: 1, source: "° (U+00B0) is the degree symbol" },
  { text: "ohm m", internal: "ohm m", factor: 1, source: "identity" },
  { text: "Ω·m", internal: "ohm m", factor: 1, source: "SI-derived: · joins unit symbols" },
  { text: "ohm*m", internal: "ohm m", factor: 1, source: "common practice: * for ·" },
  // Ratios.
  { text: "%", internal: "pu", factor: 0.01, source: "SI-derived % = 0.01" },
  { text: "pu", internal: "pu", factor: 1, source: "identity" },
  { text: "p.u.", internal: "pu", factor: 1, source: "common practice spelling of pu" },
  { text: "pu", internal: "%", factor: 100, source: "SI-derived % = 0.01" },
  { text: "%", internal: "%", factor: 1, source: "identity" },
  // Surrounding spaces are not part of the unit.
  { text: "  km  ", internal: "km", factor: 1, source: "identity" },
];

Deno.test("resolveUnit() converts every accepted unit to its internal unit", () => {
  for (const c of CONVERSIONS) {
    const label = `${JSON.stringify(c.text)} → ${c.internal} (${c.source})`;
    const r = resolveUnit(c.text, c.internal);
    assert(r.ok, `${label}: rejected ${JSON.stringify(r)}`);
    assert(
      Math.abs(r.factor - c.factor) <= REL_TOL * Math.abs(c.factor),
      `${label}: factor ${r.factor}, expected ${c.factor}`,
    );
  }
});

Deno.test("resolveUnit() converts kft (1000 ft) to km", () => {
  // "kft" (kilofoot, common practice in North-American line data, e.g. ohm/kft) is added to
  // mathjs, which gives ft no prefixes.
  // 1959: 1 kft = 1000 × 0.3048 m = 0.3048 km exactly.
  const cases = [
    { text: "kft", internal: "km" as const, factor: 0.3048 },
    { text: "ohm/kft", internal: "ohm/km" as const, factor: 1 / 0.3048 },
  ];
  for (const c of cases) {
    const r = resolveUnit(c.text, c.internal);
    assert(r.ok, `${c.text}: ${JSON.stringify(r)}`);
    assert(Math.abs(r.factor - c.factor) <= REL_TOL * c.factor, `${c.text}: ${r.factor}`);
  }
});

Deno.test("resolveUnit() reads var in any capitalisation without throwing", () => {
  // mathjs 15 has a complex-valued unit "VAR" of its own; the upper-case spellings are
  // common practice in utility data and must still mean the var (IEC 80000-6 [memory]).
  const cases = [
    { text: "kVAR", factor: 1 },
    { text: "MVAR", factor: 1e3 }, // SI-prefix M = 1e6, k = 1e3
    { text: "VAR", factor: 1e-3 }, // SI-prefix k = 1e3
    { text: "MVAr", factor: 1e3 },
    { text: "Kvar", factor: undefined }, // K is no SI prefix: rejected, not thrown
  ];
  for (const c of cases) {
    const r = resolveUnit(c.text, "kvar");
    if (c.factor === undefined) {
      assert(!r.ok && r.code === "unit.unknown", `${c.text}: ${JSON.stringify(r)}`);
      continue;
    }
    assert(r.ok, `${c.text}: ${JSON.stringify(r)}`);
    assert(Math.abs(r.factor - c.factor) <= REL_TOL * c.factor, `${c.text}: ${r.factor}`);
  }
});

interface FailureCase {
  readonly text: string;
  readonly internal: InternalUnit;
  readonly code: "unit.unknown" | "unit.dimension";
  readonly why: string;
}

const FAILURES: readonly FailureCase[] = [
  { text: "furlongz", internal: "km", code: "unit.unknown", why: "not a unit" },
  { text: "KW", internal: "kW", code: "unit.unknown", why: "K is no SI prefix (SI-prefix)" },
  { text: "5 m + 3", internal: "km", code: "unit.unknown", why: "an expression, not a unit" },
  { text: "m/1", internal: "km", code: "unit.unknown", why: "syntax garbage" },
  { text: "-km", internal: "km", code: "unit.unknown", why: "syntax garbage" },
  { text: "", internal: "km", code: "unit.unknown", why: "empty text" },
  { text: "   ", internal: "km", code: "unit.unknown", why: "only spaces" },
  { text: "\t", internal: "kV", code: "unit.unknown", why: "only a tab" },
  // Wrong dimension (SI-derived: different base dimensions).
  { text: "km", internal: "kV", code: "unit.dimension", why: "length is not voltage" },
  { text: "kV", internal: "km", code: "unit.dimension", why: "voltage is not length" },
  { text: "ohm", internal: "ohm/km", code: "unit.dimension", why: "Ω is not Ω/km" },
  { text: "A", internal: "kVA", code: "unit.dimension", why: "current is not power" },
  { text: "s", internal: "Hz", code: "unit.dimension", why: "time is not frequency" },
  // Same dimension, wrong kind of power (IEC 80000-6 keeps W, var and VA apart).
  { text: "kW", internal: "kvar", code: "unit.dimension", why: "active is not reactive" },
  { text: "kvar", internal: "kW", code: "unit.dimension", why: "reactive is not active" },
  { text: "kVA", internal: "kW", code: "unit.dimension", why: "apparent is not active" },
  { text: "MW", internal: "MVA", code: "unit.dimension", why: "active is not apparent" },
  { text: "kvar", internal: "kVA", code: "unit.dimension", why: "reactive is not apparent" },
  { text: "kVA", internal: "kvar", code: "unit.dimension", why: "apparent is not reactive" },
  { text: "kVAR", internal: "kW", code: "unit.dimension", why: "reactive is not active" },
  { text: "MVAR", internal: "MVA", code: "unit.dimension", why: "reactive is not apparent" },
  // Ratios against quantities.
  { text: "%", internal: "km", code: "unit.dimension", why: "a ratio is not a length" },
  { text: "pu", internal: "kV", code: "unit.dimension", why: "a ratio is not a voltage" },
  { text: "km", internal: "pu", code: "unit.dimension", why: "a length is not a ratio" },
  { text: "kV", internal: "%", code: "unit.dimension", why: "a voltage is not a ratio" },
  { text: "", internal: "pu", code: "unit.dimension", why: "empty text is no ratio" },
];

Deno.test("resolveUnit() rejects unknown and dimensionally wrong units with their code", () => {
  for (const c of FAILURES) {
    const label = `${JSON.stringify(c.text)} → ${c.internal} (${c.why})`;
    const r = resolveUnit(c.text, c.internal);
    assert(!r.ok, `${label}: accepted with factor ${r.ok ? r.factor : ""}`);
    equal(r.code, c.code, label);
    // The message quotes the unit as the user wrote it (STYLE.md: offending value quoted).
    assert(r.message.includes(`"${c.text}"`), `${label}: message ${r.message}`);
  }
});

Deno.test(
  "resolveUnit() rejects names of JavaScript object properties as units",
  () => {
    // Regression: the ratio table must not see Object.prototype: "constructor" is no ratio
    // and "toString" is no unit.
    const cases: readonly FailureCase[] = [
      { text: "constructor", internal: "pu", code: "unit.dimension", why: "not a ratio" },
      { text: "hasOwnProperty", internal: "%", code: "unit.dimension", why: "not a ratio" },
      { text: "valueOf", internal: "pu", code: "unit.dimension", why: "not a ratio" },
      { text: "toString", internal: "km", code: "unit.unknown", why: "not a unit" },
      { text: "constructor", internal: "kV", code: "unit.unknown", why: "not a unit" },
    ];
    for (const c of cases) {
      const r = resolveUnit(c.text, c.internal);
      deepStrictEqual(
        r.ok ? { ok: true, factorType: typeof r.factor } : { ok: false, code: r.code },
        { ok: false, code: c.code },
        `${c.text} → ${c.internal}`,
      );
    }
  },
);

Deno.test(
  "resolveUnit() does not drop a number written inside the unit text",
  () => {
    // Regression: mathjs reads "2 km" and "1e3 m" as a value with a unit and would drop the
    // number. Either rejecting such text (unit.unknown) or honouring the number is
    // acceptable; silently using a factor off by the written number is not.
    const cases = [
      { text: "2 km", internal: "km" as const, honoured: 2 }, // 2 km per unit
      { text: "1e3 m", internal: "km" as const, honoured: 1 }, // 1e3 m = 1 km (SI-prefix)
      { text: "0 km", internal: "km" as const, honoured: 0 },
      { text: "-1 km", internal: "km" as const, honoured: -1 },
    ];
    for (const c of cases) {
      const r = resolveUnit(c.text, c.internal);
      const acceptable = r.ok
        ? Math.abs(r.factor - c.honoured) <= REL_TOL * Math.abs(c.honoured) && r.factor > 0
        : r.code === "unit.unknown";
      assert(acceptable, `${c.text}: ${JSON.stringify(r)}`);
    }
  },
);

Deno.test("normalizeUnitText() rewrites the symbols users type into mathjs spellings", () => {
  // Code points: Ω U+03A9 and U+2126, µ U+00B5 and U+03BC, · U+00B7, ⋅ U+22C5, ² U+00B2,
  // ° U+00B0 (Unicode Character Database); var in any capitalisation (common practice).
  const cases: readonly [string, string][] = [
    ["\u03A9/km", "ohm/km"],
    ["\u2126/km", "ohm/km"],
    ["m\u03A9/m", "mohm/m"],
    ["\u00B5S/km", "uS/km"],
    ["\u03BCF/km", "uF/km"],
    ["\u03A9\u00B7m", "ohm m"],
    ["\u03A9\u22C5m", "ohm m"],
    ["ohm*m", "ohm m"],
    ["mm\u00B2", "mm^2"],
    ["  kV  ", "kV"],
    ["ohm   /  km", "ohm / km"],
    ["kvar", "kvar"],
    ["kVAR", "kvar"],
    ["MVAr", "Mvar"],
    ["kVAR/km", "kvar/km"],
    ["\u00B0", "deg"],
  ];
  for (const [input, expected] of cases) {
    equal(normalizeUnitText(input), expected, JSON.stringify(input));
  }
});
