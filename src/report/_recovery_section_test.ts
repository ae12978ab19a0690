/** The recovery part of a feeder page: worst fault, unit outcomes, collapse, escaping, null. */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import {
  clearingWords,
  outcomeWords,
  RECOVERY_TABLE_FAULTS,
  renderRecoverySection,
} from "./_recovery_section.ts";
import { CAUTION } from "./run_files.ts";
import type { FeederFile } from "./feeder_file.ts";
import type { FaultOutcome, FeederRecovery, UnitOutcome } from "../recovery/screen_recovery.ts";
import { makeDiagnostic } from "../model/diagnostic.ts";
import { reportFixture } from "../../tests/fixtures/report_fixtures.ts";

const count = (text: string, re: RegExp) => [...text.matchAll(re)].length;

/** Invented Norvessa values for layout tests only, never a reference for a computation. */
function fault(over: Partial<FaultOutcome> = {}): FaultOutcome {
  return {
    bus: "SKR-F1-05",
    type: "three_phase",
    condition: "max",
    clearingS: 0.32,
    clearedBy: "SKR-F1-CB",
    isolatedBuses: 0,
    tripped: ["PV-SKR-07"],
    trippedKw: 850,
    ceased: ["PV-SKR-03"],
    ceasedKw: 120,
    trippedLater: ["BESS-SKR-06"],
    trippedLaterKw: 400,
    stalled: ["LD-SKR-MILL"],
    vMinPu: 0.8412,
    vMinBus: "SKR-F1-07",
    belowThreshold: 3,
    collapsed: false,
    overloads: [{ branch: "SKR-F1-L02", percent: 118.4 }],
    ...over,
  };
}

const UNITS: readonly UnitOutcome[] = [
  { id: "PV-SKR-03", bus: "SKR-F1-03", category: "II", retainedPu: 0.2841, outcome: "ceases" },
  { id: "PV-SKR-07", bus: "SKR-F1-07", category: "I", retainedPu: 0.3112, outcome: "trips" },
  {
    id: "BESS-SKR-06",
    bus: "SKR-F1-06",
    category: "I",
    retainedPu: 0.6,
    outcome: "trips_later",
  },
  {
    id: "WT-SKR-02",
    bus: "SKR-F1-02",
    category: "III",
    retainedPu: 0.55,
    outcome: "rides_through",
  },
  { id: "PV-SKR-05", bus: "SKR-F1-05", category: "II", retainedPu: 0, outcome: "isolated" },
];

function recovery(over: Partial<FeederRecovery> = {}): FeederRecovery {
  const worst = fault();
  return {
    thresholdPu: 0.9,
    faultsSimulated: 32,
    faultsWithConsequences: 3,
    worst,
    units: UNITS,
    faults: [
      worst,
      fault({
        bus: "SKR-F1-08",
        type: "line_to_earth",
        condition: "minWithGeneration",
        clearingS: 0.08,
        clearedBy: "SKR-F1-FU8",
        tripped: [],
        trippedKw: 0,
        trippedLater: [],
        trippedLaterKw: 0,
        stalled: [],
        vMinPu: 0.9312,
        vMinBus: "SKR-F1-06",
        belowThreshold: 0,
        overloads: [],
      }),
      fault({ bus: "SKR-F1-04", trippedKw: 300, trippedLaterKw: 0, trippedLater: [] }),
    ],
    ...over,
  };
}

function withRecovery(r: FeederRecovery | null | undefined, diagnostics = false): FeederFile {
  const base = reportFixture().files[0]!;
  const why = makeDiagnostic(
    "recovery.not_screened",
    "warning",
    `Feeder "${base.feederId}": it is meshed; its recovery after faults is not screened`,
    { feederId: base.feederId },
  );
  const file: FeederFile = {
    ...base,
    diagnostics: diagnostics ? [...base.diagnostics, why] : base.diagnostics,
  };
  return r === undefined ? file : { ...file, recovery: r };
}

Deno.test("renderRecoverySection() shows the scope and the worst fault with its figures", () => {
  const page = renderRecoverySection(withRecovery(recovery())).__html;
  assert(page.includes("32 fault(s) simulated"));
  assert(page.includes("3 with consequences"));
  assert(page.includes("Recovery threshold: 0.90 pu"));
  assert(page.includes(
    "Worst fault: three-phase fault at bus SKR-F1-05 (maximum currents), cleared by SKR-F1-CB in 0.32 s.",
  ));
  assert(page.includes("Lowest voltage after clearing 0.841 pu at bus SKR-F1-07"));
  assert(page.includes("3 bus(es) stay below 0.90 pu"));
  assert(page.includes("850 kW during the fault (PV-SKR-07)"));
  assert(page.includes("400 kW after clearing (BESS-SKR-06)"));
  assert(page.includes("1,250 kW in all"));
  assert(page.includes("120 kW stops injecting during the dip"));
  assert(page.includes("Motor loads stalled: LD-SKR-MILL."));
  assert(page.includes("branch SKR-F1-L02 at 118 %"));
  // The options the findings name, and the caution.
  assert(
    page.includes(
      "require of PV-SKR-07, BESS-SKR-06 a ride-through category that rides through this fault",
    ),
  );
  assert(page.includes("dynamic reactive support near bus SKR-F1-07"));
  assert(page.includes("faster clearing by SKR-F1-CB"));
  assert(page.includes(CAUTION));
  assert(!page.includes("<script") && !/\bsrc=/.test(page) && !/\bhref=/.test(page));
});

Deno.test("renderRecoverySection() gives each unit's outcome in words", () => {
  const page = renderRecoverySection(withRecovery(recovery())).__html;
  const body = page.slice(page.indexOf('<table class="recovery-units"'));
  assertEquals(count(body.slice(0, body.indexOf("</table>")), /<tr>/g), 1 + UNITS.length);
  for (
    const [outcome, words] of [
      ["rides_through", "rides through"],
      ["ceases", "stops injecting during the dip"],
      ["trips", "trips"],
      ["trips_later", "trips after clearing"],
      ["isolated", "cut off with the faulted section"],
    ] as const
  ) {
    assertEquals(outcomeWords(outcome), words);
    assert(body.includes(`<td>${words}</td>`), `missing ${words}`);
  }
  assert(body.includes("0.284") && body.includes("0.311") && body.includes("0.000"));
});

Deno.test("renderRecoverySection() lists the other faults without the worst", () => {
  const page = renderRecoverySection(withRecovery(recovery())).__html;
  const body = page.slice(page.indexOf('<table class="recovery-faults"'));
  assertEquals(count(body, /<tr>/g), 1 + 2);
  assert(!body.includes("<td>SKR-F1-05</td>"));
  assert(body.includes("<td>SKR-F1-08</td>") && body.includes("line-to-earth"));
  assert(body.includes("minimum currents, generation in service"));
  assert(body.includes("0.08 s") && body.includes("SKR-F1-FU8"));
  assert(body.includes("0.931") && body.includes("bus SKR-F1-06"));
  assert(body.indexOf("SKR-F1-08") < body.indexOf("SKR-F1-04"));
});

Deno.test("renderRecoverySection() caps the fault table and says how many are left out", () => {
  const many = Array.from({ length: 30 }, (_, i) => fault({ bus: `N-${i}` }));
  const r = recovery({ faults: [fault(), ...many], faultsWithConsequences: 40 });
  const page = renderRecoverySection(withRecovery(r)).__html;
  const body = page.slice(page.indexOf('<table class="recovery-faults"'));
  assertEquals(count(body, /<tr>/g), 1 + RECOVERY_TABLE_FAULTS);
  assert(page.includes(`; ${40 - 1 - RECOVERY_TABLE_FAULTS} more are not listed`));
});

Deno.test("renderRecoverySection() words a collapse and a fault no feeder device clears", () => {
  const worst = fault({
    clearedBy: null,
    clearingS: 2,
    isolatedBuses: 8,
    vMinPu: null,
    vMinBus: null,
    collapsed: true,
    overloads: [],
  });
  const page = renderRecoverySection(withRecovery(recovery({ worst, faults: [worst] }))).__html;
  assert(page.includes("No load-flow solution after clearing: the feeder collapses."));
  assert(page.includes("not cleared by the feeder&#39;s own devices (taken to last 2.00 s)"));
  assert(page.includes("8 bus(es) cut off with the faulted section"));
  assert(page.includes("No branch overloads after clearing."));
  assert(page.includes("No other fault has consequences."));
  assert(page.includes("dynamic reactive support;") && !page.includes("faster clearing by"));
  assertEquals(
    clearingWords(fault({ clearedBy: "F-1", clearingS: 0.012 })),
    "cleared by F-1 in 0.01 s",
  );
  // A collapsed fault in the table.
  const table = renderRecoverySection(
    withRecovery(recovery({ faults: [fault(), { ...worst, bus: "SKR-F1-09" }] })),
  ).__html;
  const body = table.slice(table.indexOf('<table class="recovery-faults"'));
  assert(body.includes("collapses") && body.includes("no load-flow solution"));
  assert(body.includes("no feeder device"));
});

Deno.test("renderRecoverySection() escapes ids", () => {
  const evil = '<b id="x">&</b>';
  const worst = fault({ bus: evil, clearedBy: evil, vMinBus: evil, stalled: [evil] });
  const units: UnitOutcome[] = [{ ...UNITS[0]!, id: evil, bus: evil, category: evil }];
  const page = renderRecoverySection(
    withRecovery(recovery({ worst, units, faults: [fault(), worst] })),
  ).__html;
  assert(!page.includes("<b "));
  assert(page.includes("&lt;b id=&quot;x&quot;&gt;&amp;&lt;/b&gt;"));
});

Deno.test("renderRecoverySection() says why a feeder is not screened", () => {
  const meshed = renderRecoverySection(withRecovery(null, true)).__html;
  assertEquals(
    meshed,
    '<p class="note">Recovery after faults was not screened on this feeder: it is meshed.</p>',
  );
  for (const r of [null, undefined]) {
    const off = renderRecoverySection(withRecovery(r)).__html;
    assert(off.includes("not part of this run") && !off.includes("<table"));
  }
  const none = renderRecoverySection(
    withRecovery(recovery({ worst: null, units: [], faults: [], faultsWithConsequences: 0 })),
  ).__html;
  assert(none.includes("No fault has consequences") && none.includes(CAUTION));
});
