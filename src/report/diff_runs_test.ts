import { deepStrictEqual as assertEquals } from "node:assert/strict";
import { diffRuns, type FeederResultFile, formatDiff } from "./diff_runs.ts";

const feeder = (
  id: string,
  vMax: number,
  findings: FeederResultFile["findings"] = [],
  status = "studied",
): FeederResultFile => ({
  feederId: id,
  status,
  cases: [{
    caseId: "min",
    vMinPu: 1,
    vMaxPu: vMax,
    maxLoadingPercent: 10,
    maxDgChangePercent: 1,
    lossesKw: 2,
  }],
  findings,
});

Deno.test("diffRuns() lists changed, added and removed feeders with before and after", () => {
  const rise = {
    caseId: "min",
    code: "voltage.dg_change",
    where: { id: "B7" },
    severity: "violation",
  };
  const a = new Map([["F1", feeder("F1", 1.03)], ["F2", feeder("F2", 1.02)], [
    "F3",
    feeder("F3", 1.01),
  ]]);
  const b = new Map([["F1", feeder("F1", 1.05, [rise])], ["F2", feeder("F2", 1.02)], [
    "F4",
    feeder("F4", 1.0),
  ]]);
  const d = diffRuns(a, b);
  assertEquals(d.map((x) => [x.feederId, x.change]), [["F1", "changed"], ["F3", "removed"], [
    "F4",
    "added",
  ]]);
  assertEquals(d[0]!.figures, [{ caseId: "min", figure: "vMaxPu", before: 1.03, after: 1.05 }]);
  assertEquals(d[0]!.findingsAdded, ["min violation voltage.dg_change at B7"]);
  assertEquals(
    formatDiff(d).split("\n").slice(0, 4),
    [
      "3 feeder(s) changed:",
      "F1 (changed)",
      "  min vMaxPu: 1.03 → 1.05",
      "  + min violation voltage.dg_change at B7",
    ],
  );
});

Deno.test("diffRuns() of a run with itself is empty", () => {
  const a = new Map([["F1", feeder("F1", 1.03)]]);
  assertEquals(diffRuns(a, a), []);
  assertEquals(formatDiff([]), "No feeder changed.");
});

Deno.test("diffRuns() reports a change of status alone", () => {
  const d = diffRuns(
    new Map([["F1", feeder("F1", 1)]]),
    new Map([["F1", feeder("F1", 1, [], "failed")]]),
  );
  assertEquals(d.map((x) => [x.statusBefore, x.statusAfter]), [["studied", "failed"]]);
});

Deno.test("diffRuns() lists needs whose remedy changed as removed and added", () => {
  const need = (cost: number) => ({ kind: "line_overload", remedy: { kind: "reconductor", cost } });
  const a = new Map([["F1", { ...feeder("F1", 1.02), needs: [need(84)] }]]);
  const b = new Map([["F1", { ...feeder("F1", 1.02), needs: [need(322)] }]]);
  const d = diffRuns(a, b);
  assertEquals(d[0]!.needsAdded, ["line_overload: reconductor, cost 322"]);
  assertEquals(d[0]!.needsRemoved, ["line_overload: reconductor, cost 84"]);
  assertEquals(formatDiff(d).split("\n").slice(2), [
    "  + need line_overload: reconductor, cost 322",
    "  − need line_overload: reconductor, cost 84",
  ]);
  // A file written before the ranking stage has no needs: not a change by itself.
  assertEquals(
    diffRuns(
      new Map([["F1", feeder("F1", 1.02)]]),
      new Map([["F1", { ...feeder("F1", 1.02), needs: [] }]]),
    ),
    [],
  );
});
