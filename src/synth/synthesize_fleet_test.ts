/**
 * The synthetic fleet is invented data, so these tests check invariants, not values: the
 * fleet passes the project's own validation and studies, it is deterministic per seed, it has
 * the requested sizes, and it keeps the realism rules of the generator (common practice:
 * reach in km near the nominal kV, conductors that taper downstream, protection at the head).
 */
import { deepStrictEqual as assertEquals, ok as assert, throws } from "node:assert/strict";
import { memorySource } from "../ingest/read_network.ts";
import { parseCsvText } from "../ingest/csv_rows.ts";
import { validateFleet } from "../pipeline/validate_fleet.ts";
import { studyFeeder } from "../pipeline/study_feeder.ts";
import { DEFAULT_PIPELINE } from "../pipeline/pipeline_config.ts";
import { BRANCH_LINE, BRANCH_SWITCH, type FeederForm } from "../model/feeder_form.ts";
import {
  CHUNK_CHARS,
  synthesizeFleet,
  synthesizeFleetFiles,
  type SynthOptions,
} from "./synthesize_fleet.ts";

const SMALL: SynthOptions = { feeders: 12, busesPerFeeder: 40, seed: 1 };
const smallFiles = synthesizeFleetFiles(SMALL);
const small = await validateFleet(memorySource(smallFiles));
const studies = small.value.forms.map((f) => studyFeeder(f, DEFAULT_PIPELINE));

Deno.test("synthesizeFleetFiles() gives fleets that validate with no diagnostics and exact sizes", async () => {
  // Buses per feeder are the buses whose `feeder` cell names it (head, device and tree
  // buses); each substation adds two buses of its own that belong to no feeder.
  const cases: SynthOptions[] = [
    SMALL,
    { feeders: 3, busesPerFeeder: 2, seed: 5 },
    { feeders: 9, busesPerFeeder: 17, seed: -3, dgPenetration: 0 },
    { feeders: 21, busesPerFeeder: 25, seed: 2 ** 40 + 7, dgPenetration: 1.2 },
  ];
  for (const o of cases) {
    const fleet = o === SMALL ? small : await validateFleet(memorySource(synthesizeFleetFiles(o)));
    const label = JSON.stringify(o);
    assertEquals(fleet.diagnostics, [], label);
    assertEquals(fleet.value.feeders.length, o.feeders, label);
    assertEquals(fleet.value.feeders.map((f) => f.status), new Array(o.feeders).fill("valid"));
    assertEquals(
      fleet.value.feeders.map((f) => f.buses),
      new Array(o.feeders).fill(o.busesPerFeeder),
    );
    assertEquals(fleet.value.islands, [], label);
  }
});

Deno.test("synthesizeFleetFiles() is deterministic per seed", () => {
  assertEquals(synthesizeFleetFiles(SMALL), smallFiles);
  const other = synthesizeFleetFiles({ ...SMALL, seed: 2 });
  assert(other["lines.csv"] !== smallFiles["lines.csv"]);
  assert(other["loads.csv"] !== smallFiles["loads.csv"]);
});

Deno.test("synthesizeFleetFiles() names everything with synthetic SYN- ids", async () => {
  const idColumns: Record<string, number[]> = {
    "buses.csv": [0],
    "grid_sources.csv": [0, 1],
    "line_types.csv": [0],
    "lines.csv": [0, 1, 2, 3],
    "transformers.csv": [0, 1, 2],
    "switches.csv": [0, 1, 2],
    "loads.csv": [0, 1],
    "generators.csv": [0, 1],
    "relay_stages.csv": [0, 1],
    "fuse_curves.csv": [0],
    "reactive_curves.csv": [0],
  };
  for (const [file, columns] of Object.entries(idColumns)) {
    const { rows } = await parseCsvText(smallFiles[file]!);
    assert(rows.length > 1, file);
    for (const row of rows.slice(1)) {
      for (const c of columns) assert(row.cells[c]!.startsWith("SYN-"), `${file}: ${row.cells[c]}`);
    }
  }
});

Deno.test("synthesizeFleetFiles() keeps each feeder's reach within 1.5 km per kV", () => {
  // Common practice: a feeder's reach in km stays near its nominal voltage in kV.
  for (const f of small.value.feeders) {
    assert(f.reachKm !== null && f.vnKv !== null, f.feederId);
    assert(f.reachKm > 0 && f.reachKm <= 1.5 * f.vnKv, `${f.feederId}: ${f.reachKm} km`);
  }
});

/** Ratings of every line and of the nearest line upstream of it (through switches). */
function lineRatingPairs(form: FeederForm): [number, number][] {
  const pairs: [number, number][] = [];
  for (let k = form.substationBusCount; k < form.nBus; k++) {
    if (form.branchKind[k - 1] !== BRANCH_LINE) continue;
    for (let j = form.parent[k]!; j > 0; j = form.parent[j]!) {
      const kind = form.branchKind[j - 1];
      if (kind === BRANCH_LINE) pairs.push([form.ratingA[k - 1]!, form.ratingA[j - 1]!]);
      if (kind !== BRANCH_SWITCH) break;
    }
  }
  return pairs;
}

Deno.test("synthesizeFleetFiles() tapers conductors: no line is rated above the line feeding it", () => {
  for (const form of small.value.forms) {
    const pairs = lineRatingPairs(form);
    assert(pairs.length >= form.nBus - form.substationBusCount - 10, form.feederId);
    for (const [down, up] of pairs) assert(down <= up, `${form.feederId}: ${down} A after ${up} A`);
    // And it does taper: the far end of the feeder is on smaller conductors than the head.
    assert(pairs.some(([down, up]) => down < up), form.feederId);
  }
});

Deno.test("synthesizeFleetFiles() mixes cable and overhead line differently per feeder", () => {
  const shares = small.value.feeders.map((f) => f.cableKm / f.lineKm);
  assert(shares.some((s) => s >= 0.8), `cable shares ${shares}`);
  assert(shares.some((s) => s <= 0.3), `cable shares ${shares}`);
});

Deno.test("synthesizeFleetFiles() installs generation at the requested share of peak demand", async () => {
  const cases = [
    { o: SMALL, share: 0.6 },
    { o: { feeders: 17, busesPerFeeder: 30, seed: 9, dgPenetration: 0.25 }, share: 0.25 },
    { o: { feeders: 17, busesPerFeeder: 30, seed: 9, dgPenetration: 1.5 }, share: 1.5 },
    { o: { feeders: 5, busesPerFeeder: 30, seed: 9, dgPenetration: 0 }, share: 0 },
  ];
  for (const { o, share } of cases) {
    const fleet = o === SMALL ? small : await validateFleet(memorySource(synthesizeFleetFiles(o)));
    let peakKw = 0, dgKw = 0;
    for (const f of fleet.value.feeders) {
      peakKw += f.peakLoadKw;
      dgKw += f.generationKw;
      assertEquals(f.generationKw, f.generationByKindKw.converter);
    }
    const want = share * peakKw;
    assert(Math.abs(dgKw - want) <= 0.15 * want, `${JSON.stringify(o)}: ${dgKw} kW, want ${want}`);
  }
  // Some feeders carry a larger share than the average, for voltage-change findings.
  const shares = small.value.feeders.map((f) => f.generationKw / f.peakLoadKw);
  assert(shares.some((s) => s > 1.2), `shares ${shares}`);
});

Deno.test("synthesizeFleetFiles() puts loads at most buses", () => {
  for (const form of small.value.forms) {
    const feederBuses = form.nBus - form.substationBusCount;
    assert(form.loads.n >= 0.6 * feederBuses, `${form.feederId}: ${form.loads.n} loads`);
    for (let i = 0; i < form.loads.n; i++) {
      assert(form.loads.minPKw[i]! <= form.loads.peakPKw[i]!);
      assert(form.loads.peakQKvar[i]! > 0, "inductive power factor");
    }
  }
});

Deno.test("synthesizeFleetFiles() protects every feeder: head breaker relay, reclosers, fuses", () => {
  let reclosers = 0, fuses = 0;
  for (const form of small.value.forms) {
    const head = form.devices.filter((d) => d.isHead);
    assertEquals(head.map((d) => d.kind), ["breaker"], form.feederId);
    const stages = head[0]!.relays.flatMap((r) => r.stages);
    const has = (element: string, ch: readonly string[]) =>
      stages.some((s) => s.element === element && ch.includes(s.characteristic));
    assert(has("phase", ["iec_standard_inverse"]), form.feederId);
    assert(has("earth", ["iec_standard_inverse"]), form.feederId);
    assert(has("phase", ["definite_time", "instantaneous"]), `${form.feederId} high-set`);
    for (const d of form.devices.filter((d) => d.kind === "recloser")) {
      reclosers++;
      const sets = d.relays.flatMap((r) => r.stages.map((s) => s.curveSet));
      assert(sets.includes("fast") && sets.includes("delayed"), d.id);
      assert(d.fastShots >= 1 && d.delayedShots >= 1, d.id);
    }
    for (const d of form.devices.filter((d) => d.kind === "fuse")) {
      fuses++;
      assert(d.fuseCurve !== undefined && d.fuseCurve.melt.length >= 6, d.id);
    }
  }
  assert(reclosers > 0 && fuses > 0, `${reclosers} reclosers, ${fuses} fuses`);
});

Deno.test("synthesizeFleetFiles() ties neighbouring feeders of one substation through open switches", () => {
  const sourceOf = new Map(small.value.feeders.map((f) => [f.feederId, f.sourceId]));
  const ties = small.value.forms.flatMap((f) =>
    f.openPoints.map((p) => ({ feeder: f.feederId, other: p.otherSide }))
  );
  assert(ties.length >= 2, `${ties.length} open points`);
  for (const t of ties) {
    assert(sourceOf.has(t.other), `${t.feeder} tied to ${t.other}`);
    assertEquals(sourceOf.get(t.other), sourceOf.get(t.feeder));
  }
});

Deno.test("studyFeeder() solves every case of every synthetic feeder", () => {
  assertEquals(studies.length, SMALL.feeders);
  for (const s of studies) {
    assertEquals(s.status, "studied", s.feederId);
    assert(s.cases.every((c) => c.converged), s.feederId);
  }
});

Deno.test("studyFeeder() finds generation-caused voltage change on some synthetic feeders only", () => {
  const withChange = studies.filter((s) =>
    s.findings.some((f) => f.code === "voltage.dg_change" && f.caseId === "min-full-dg")
  );
  assert(withChange.length >= 1 && withChange.length < studies.length, `${withChange.length}`);
  // No feeder leaves the voltage band at peak demand.
  for (const s of studies) {
    const peak = s.findings.filter((f) =>
      f.caseId === "peak-no-dg" && f.code.startsWith("voltage.")
    );
    assertEquals(peak, [], s.feederId);
  }
});

Deno.test("studyFeeder() loads the synthetic head sections moderately at peak", () => {
  const headLoading = studies.map((s) => {
    const peak = s.cases.find((c) => c.caseId === "peak-no-dg")!;
    return peak.branches!.find((b) => b.id === `${s.feederId}-L0002`)!.loadingPercent;
  });
  for (const l of headLoading) assert(l > 10 && l < 100, `head loading ${headLoading}`);
  const sorted = [...headLoading].sort((a, b) => a - b);
  const median = sorted[sorted.length >> 1]!;
  assert(median >= 30 && median <= 70, `median head loading ${median} %`);
});

Deno.test("synthesizeFleet() streams bounded chunks that add up to synthesizeFleetFiles()", () => {
  const o: SynthOptions = { feeders: 50, busesPerFeeder: 200, seed: 11 };
  const chunks = [...synthesizeFleet(o)];
  const files = synthesizeFleetFiles(o);
  const joined: Record<string, string> = {};
  const counts: Record<string, number> = {};
  const encoder = new TextEncoder();
  for (const { file, text } of chunks) {
    const bytes = encoder.encode(text).length;
    assert(bytes <= 1_000_000 && bytes <= CHUNK_CHARS + 4096, `${file}: ${bytes} bytes`);
    if (joined[file] === undefined) {
      const header = files[file]!.slice(0, files[file]!.indexOf("\n") + 1);
      assert(text.startsWith(header), `${file} starts with its header`);
    }
    joined[file] = (joined[file] ?? "") + text;
    counts[file] = (counts[file] ?? 0) + 1;
  }
  assertEquals(joined, files);
  assert(Object.values(counts).some((c) => c > 1), "some file comes in several chunks");
  const lines = files["buses.csv"]!.split("\n").length - 2; // header and final newline
  assert(lines >= o.feeders * o.busesPerFeeder);
});

Deno.test("synthesizeFleet() refuses impossible options", () => {
  const cases: SynthOptions[] = [
    { feeders: 0, busesPerFeeder: 10, seed: 1 },
    { feeders: 2.5, busesPerFeeder: 10, seed: 1 },
    { feeders: 2, busesPerFeeder: 1, seed: 1 },
    { feeders: 2, busesPerFeeder: 10, seed: 0.5 },
    { feeders: 2, busesPerFeeder: 10, seed: 1, dgPenetration: -0.1 },
  ];
  for (const o of cases) throws(() => synthesizeFleet(o).next(), RangeError, JSON.stringify(o));
});
