/** The hosting capacity part of a feeder page: strategies, gains, criteria, chart, escaping. */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import {
  criterionWords,
  gainPercent,
  HOSTING_TABLE_BUSES,
  queueVerdictWords,
  renderHostingSection,
} from "./_hosting_section.ts";
import { busDistances, hostingChart } from "./_hosting_chart.ts";
import { CAUTION } from "./run_files.ts";
import type { FeederFile } from "./feeder_file.ts";
import type { FeederHosting, HostingBusRow } from "../hosting/host_feeder.ts";
import type { HostingCriterion } from "../hosting/hosting_margin.ts";
import type { QueueRow } from "../hosting/check_queue.ts";
import { reportFixture } from "../../tests/fixtures/report_fixtures.ts";

const count = (text: string, re: RegExp) => [...text.matchAll(re)].length;

/** Invented Norvessa values for layout tests only, never a reference for a computation. */
const BUSES: readonly (readonly [bus: string, unityKw: number, voltVarKw: number])[] = [
  ["SKR-F1-01", 2400, 2900],
  ["SKR-F1-02", 1800, 2200],
  ["SKR-F1-03", 1250, 1500],
  ["SKR-F1-04", 1100, 1320],
  ["SKR-F1-05", 1600, 1900],
  ["SKR-F1-06", 1400, 1700],
  ["SKR-F1-07", 900, 1080],
];

function row(
  bus: string,
  strategy: string,
  capacityKw: number,
  criterion: HostingCriterion,
  code = "limit.overvoltage",
): HostingBusRow {
  return {
    bus,
    strategy,
    capacityKw,
    criterion,
    code,
    where: { kind: "bus", id: bus },
    sourceQShiftKvar: strategy === "unity" ? 0 : 180,
    lossesChangeKw: -3.5,
    screenedKw: capacityKw * 0.98,
    loadFlows: 4,
  };
}

function hosting(over: Partial<FeederHosting> = {}): FeederHosting {
  return {
    caseId: "min-full-dg",
    unitKind: "converter",
    protectionChecked: true,
    strategies: [
      {
        strategy: "unity",
        label: "unity power factor",
        minKw: 900,
        minBus: "SKR-F1-07",
        medianKw: 1400,
        spreadKw: 3200,
        spreadCriterion: "overvoltage",
        spreadWhere: { kind: "bus", id: "SKR-F1-07" },
        spreadSourceQShiftKvar: 0,
        spreadLossesChangeKw: -12.5,
      },
      {
        strategy: "volt_var",
        label: "volt-var, IEEE 1547 Category B default",
        minKw: 1080,
        minBus: "SKR-F1-07",
        medianKw: 1700,
        spreadKw: 4000,
        spreadCriterion: "thermal",
        spreadWhere: { kind: "branch", id: "SKR-F1-01-IN" },
        spreadSourceQShiftKvar: 640,
        spreadLossesChangeKw: 8.25,
      },
    ],
    buses: BUSES.flatMap(([bus, u, v]) => [
      row(bus, "unity", u, "overvoltage"),
      row(bus, "volt_var", v, bus === "SKR-F1-01" ? "thermal" : "voltage_change"),
    ]),
    loadFlows: 140,
    sweeps: 700,
    queue: [],
    ...over,
  };
}

function withHosting(h: FeederHosting | null): FeederFile {
  return { ...reportFixture().files[0]!, hosting: h };
}

Deno.test("renderHostingSection() shows each strategy with its gain over the reference", async () => {
  const page = (await renderHostingSection(withHosting(hosting()), "feeder-SKR-F1-hc")).__html;
  assert(page.includes("unity power factor") && page.includes("reference"));
  assert(page.includes("volt-var, IEEE 1547 Category B default"));
  // Spread 3,200 → 4,000 kW: +25.0 %; median 1,400 → 1,700: +21.4 %; lowest 900 → 1,080: +20.0 %.
  assert(page.includes("3,200") && page.includes("4,000"));
  assert(page.includes("+25.0 %") && page.includes("+21.4 %") && page.includes("+20.0 %"));
  assert(
    page.includes(
      "volt-var, IEEE 1547 Category B default against unity power factor: spread capacity +25.0 %",
    ),
  );
  // What binds the spread capacity, the reactive power and the losses at it.
  assert(page.includes("overvoltage at bus SKR-F1-07"));
  assert(page.includes("thermal loading at branch SKR-F1-01-IN"));
  assert(page.includes("+640") && page.includes("+8.3") && page.includes("-12.5"));
  assert(page.includes(CAUTION));
  assert(!page.includes("protection criterion is not included"));
});

Deno.test("renderHostingSection() draws capacity against distance and lists every small feeder bus", async () => {
  const page = (await renderHostingSection(withHosting(hosting()), "feeder-SKR-F1-hc")).__html;
  assertEquals(count(page, /<svg /g), 1);
  assert(page.includes("Distance from the source (km)"));
  assert(page.includes("Hosting capacity at the bus (kW)"));
  assert(!page.includes("<script") && !/\bsrc=/.test(page) && !/url\((?!#)/.test(page));
  const body = page.slice(page.indexOf('<table class="hosting-buses"'));
  assertEquals(count(body, /<tr>/g), 1 + BUSES.length);
  assert(body.includes("voltage change by generation at bus SKR-F1-03"));
  assert(body.includes("6.20")); // SKR-F1-07's distance, km
  assert(page.includes("Every bus of the feeder, from the source outwards"));
});

Deno.test("renderHostingSection() caps the bus table at the lowest-capacity buses", async () => {
  const many: HostingBusRow[] = [];
  for (let i = 0; i < 50; i++) {
    const id = `N-${String(i).padStart(2, "0")}`;
    many.push(row(id, "unity", 5000 - 50 * i, "overvoltage"));
    many.push(row(id, "volt_var", 6000 - 50 * i, "overvoltage"));
  }
  const page = (await renderHostingSection(withHosting(hosting({ buses: many })), "x-hc")).__html;
  const body = page.slice(page.indexOf('<table class="hosting-buses"'));
  assertEquals(count(body, /<tr>/g), 1 + HOSTING_TABLE_BUSES);
  assert(page.includes(`The ${HOSTING_TABLE_BUSES} buses of 50 with the lowest capacity`));
  assert(body.indexOf("N-49") < body.indexOf("N-48") && !body.includes("N-19<"));
  // The chart has no distances for these invented buses.
  assert(page.includes("50 buses have no distance from the source"));
});

Deno.test("renderHostingSection() escapes ids and labels and names protection findings", async () => {
  const h = hosting({
    protectionChecked: false,
    unitKind: "synchronous",
    buses: [
      row('<b>"x"&', "unity", 500, "protection", "protection.sympathetic_trip"),
      row('<b>"x"&', "volt_var", 5000, "search_range", "hosting.range"),
    ],
    strategies: hosting().strategies.map((s, i) =>
      i === 0 ? { ...s, label: "<i>unity</i>", minBus: '<b>"x"&' } : s
    ),
  });
  const page = (await renderHostingSection(withHosting(h), "x-hc")).__html;
  assert(!page.includes("<b>") && !page.includes("<i>unity"));
  assert(page.includes("&lt;b&gt;&quot;x&quot;&amp;"));
  assert(page.includes("&lt;i&gt;unity&lt;/i&gt;"));
  assert(page.includes("protection: sympathetic trip at bus &lt;b&gt;"));
  assert(page.includes("≥ 5,000") && page.includes("top of the search range"));
  assert(page.includes("The protection criterion is not included on this feeder"));
  assert(page.includes("new synchronous unit"));
});

Deno.test("renderHostingSection() says why a feeder has no hosting capacity", async () => {
  const none = (await renderHostingSection(withHosting(null), "x-hc")).__html;
  assert(none.includes("Per-bus hosting capacity is not part of this run."));
  const file: FeederFile = {
    ...withHosting(null),
    diagnostics: [{
      code: "hosting.not_studied",
      severity: "warning",
      message: 'Feeder "SKR-F1": it is meshed (the hosting study covers radial feeders)',
    }],
  };
  const meshed = (await renderHostingSection(file, "x-hc")).__html;
  assert(
    meshed.includes("was not studied on this feeder: Feeder &quot;SKR-F1&quot;: it is meshed"),
  );
});

/** Invented Norvessa applications: one fits, one needs a control setting, one reinforcement. */
const QUEUE: readonly QueueRow[] = [
  {
    application: "GA-0117",
    position: 1,
    bus: "SKR-F1-03",
    sizeKw: 800,
    kind: "converter",
    strategy: "unity",
    verdict: "fits",
    upgrade: null,
    alternative: null,
    criterion: null,
    code: null,
    where: null,
  },
  {
    application: "GA-0124",
    position: 2,
    bus: "SKR-F1-07",
    sizeKw: 1250,
    kind: "converter",
    strategy: "unity",
    verdict: "needs_works",
    upgrade: "control_setting",
    alternative: "volt_var",
    criterion: "overvoltage",
    code: "limit.overvoltage",
    where: { kind: "bus", id: "SKR-F1-07" },
  },
  {
    application: "GA-0131",
    position: 3,
    bus: "SKR-F1-05",
    sizeKw: 2600,
    kind: "synchronous",
    strategy: "volt_var",
    verdict: "needs_works",
    upgrade: "reinforcement",
    alternative: null,
    criterion: "thermal",
    code: "limit.thermal",
    where: { kind: "branch", id: "SKR-F1-01-IN" },
  },
];

Deno.test("renderHostingSection() lists the generation applications in queue order", async () => {
  const page = (await renderHostingSection(withHosting(hosting({ queue: QUEUE })), "x-hc")).__html;
  assert(page.includes("Generation applications in queue order"));
  assert(page.includes("checked on top of the earlier ones that fit"));
  assert(page.includes("stays out of the base for later ones"));
  const body = page.slice(page.indexOf('<table class="hosting-queue"'));
  assertEquals(count(body, /<tr>/g), 1 + QUEUE.length);
  assert(body.indexOf("GA-0117") < body.indexOf("GA-0124"));
  assert(body.indexOf("GA-0124") < body.indexOf("GA-0131"));
  assert(body.includes(">fits<"));
  assert(
    body.includes("needs works: control setting — use volt-var, IEEE 1547 Category B default"),
  );
  assert(body.includes("needs works: reinforcement"));
  assert(body.includes("overvoltage at bus SKR-F1-07"));
  assert(body.includes("thermal loading at branch SKR-F1-01-IN"));
  assert(body.includes("1,250") && body.includes("2,600"));
  assert(body.includes("converter-connected") && body.includes("synchronous"));
  assert(page.indexOf("hosting-queue") < page.indexOf(CAUTION));
});

Deno.test("renderHostingSection() shows no queue table for an empty queue", async () => {
  const page = (await renderHostingSection(withHosting(hosting()), "x-hc")).__html;
  assert(!page.includes("hosting-queue") && !page.includes("queue order"));
});

Deno.test("renderHostingSection() escapes the queue's ids and words", async () => {
  const queue: QueueRow[] = [{
    ...QUEUE[1]!,
    application: '<b>"GA"&',
    bus: "<i>bus</i>",
    alternative: "<s>alt</s>",
    criterion: "protection",
    code: "protection.<u>blind</u>",
    where: { kind: "branch", id: "R<1>" },
  }];
  const page = (await renderHostingSection(withHosting(hosting({ queue })), "x-hc")).__html;
  const body = page.slice(page.indexOf('<table class="hosting-queue"'));
  assert(!/<(b|i|s|u)>/.test(body));
  assert(body.includes("&lt;b&gt;&quot;GA&quot;&amp;"));
  assert(body.includes("&lt;i&gt;bus&lt;/i&gt;"));
  assert(body.includes("control setting — use &lt;s&gt;alt&lt;/s&gt;"));
  assert(body.includes("protection: &lt;u&gt;blind&lt;/u&gt; at branch R&lt;1&gt;"));
});

Deno.test("queueVerdictWords() gives each verdict in plain words", () => {
  const names = new Map([["volt_var", "volt-var"]]);
  const base = QUEUE[0]!;
  const cases: [Partial<QueueRow>, string][] = [
    [{ verdict: "fits" }, "fits"],
    [{ verdict: "not_studied" }, "not studied"],
    [
      { verdict: "needs_works", upgrade: "control_setting", alternative: "volt_var" },
      "needs works: control setting — use volt-var",
    ],
    [
      { verdict: "needs_works", upgrade: "control_setting", alternative: "pf_fixed" },
      "needs works: control setting — use pf_fixed",
    ],
    [{ verdict: "needs_works", upgrade: "reinforcement" }, "needs works: reinforcement"],
    [{ verdict: "needs_works", upgrade: "protection" }, "needs works: protection"],
  ];
  for (const [over, want] of cases) {
    assertEquals(queueVerdictWords({ ...base, ...over }, names), want);
  }
});

Deno.test("gainPercent() and criterionWords() give the table's words", () => {
  const cases: [number, number, number | null][] = [
    [1200, 1000, 20],
    [800, 1000, -20],
    [1000, 0, null],
    [1000, 0.4, null],
    [Infinity, 1000, null],
  ];
  for (const [v, ref, want] of cases) {
    const got = gainPercent(v, ref);
    if (want === null) assertEquals(got, null);
    else assert(got !== null && Math.abs(got - want) <= 1e-9 * Math.abs(want));
  }
  assertEquals(criterionWords("rapid_change"), "rapid voltage change when the unit trips");
  assertEquals(criterionWords("no_solution"), "load flow stops solving");
  assertEquals(criterionWords("protection", "protection.blinding"), "protection: blinding");
});

Deno.test("busDistances() takes the hosting case's distances first", () => {
  const km = busDistances(withHosting(null), "min-full-dg");
  assertEquals(km.get("SKR-F1-07"), 6.2);
  assertEquals(km.get("SKR-B20"), 0);
});

Deno.test("hostingChart() is the same text for the same input and bins very large feeders", async () => {
  const file = withHosting(hosting());
  const a = await hostingChart(file, file.hosting!, "p");
  const b = await hostingChart(file, file.hosting!, "p");
  assertEquals(a.svg, b.svg);
  assertEquals(a.notes, []);
  const cases = file.cases.map((c) => ({
    ...c,
    buses: Array.from(
      { length: 700 },
      (_, k) => ({ ...c.buses![0]!, id: `B${k}`, distanceKm: k / 100 }),
    ),
  }));
  const big = hosting({
    buses: Array.from({ length: 700 }, (_, k) => row(`B${k}`, "unity", 1000 + k, "overvoltage")),
  });
  const binned = await hostingChart({ ...file, cases, hosting: big }, big, "q");
  assert(binned.svg !== null);
  assert(binned.notes.some((n) => n.includes("equal distance bins")));
});
