/** From findings to needs: grouping, worst finding, excess arithmetic, customers touched. */
import { deepStrictEqual as assertEquals } from "node:assert/strict";
import { formOfTables } from "../../tests/fixtures/small_feeders.ts";
import { TWO_FEEDERS } from "../../tests/fixtures/two_feeders.ts";
import type { Finding } from "../checks/finding.ts";
import { classifyNeeds, excessPercent } from "./classify_needs.ts";

Deno.test("excessPercent() measures the excess against the allowed margin", () => {
  const cases: [Pick<Finding, "code" | "value" | "limit">, number][] = [
    // 1.12 pu against a 1.10 pu band edge: 0.02 of a 0.10 margin.
    [{ code: "voltage.above_band", value: 1.12, limit: 1.1 }, 20],
    // 0.88 pu against 0.90: 0.02 of 0.10.
    [{ code: "voltage.below_band", value: 0.88, limit: 0.9 }, 20],
    // 2.5 % change against a 2 % limit; a fall counts by its size.
    [{ code: "voltage.dg_change", value: -2.5, limit: 2 }, 25],
    // 130 % loading against 100 %.
    [{ code: "thermal.overload", value: 130, limit: 100 }, 30],
  ];
  for (const [f, want] of cases) {
    assertEquals(Math.round(excessPercent(f) * 1e9) / 1e9, want, f.code);
  }
});

Deno.test("classifyNeeds() groups violations by kind, names the worst and counts customers once", async () => {
  // TWO_FEEDERS' feeder F1: A1 (10 customers), A2 (12), A3 (0) and A4 (3, behind fuse FU1).
  const form = await formOfTables(TWO_FEEDERS);
  const f = (
    code: string,
    kind: "bus" | "branch",
    id: string,
    value: number,
    limit: number,
    caseId = "peak",
  ): Finding => ({
    feederId: form.feederId,
    code,
    severity: "violation",
    where: { kind, id },
    value,
    limit,
    unit: kind === "bus" ? "pu" : "%",
    caseId,
    message: "",
  });
  const findings: Finding[] = [
    f("voltage.below_band", "bus", "A2", 0.89, 0.9),
    f("voltage.below_band", "bus", "A2", 0.885, 0.9, "winter"),
    f("voltage.below_band", "bus", "A1", 0.895, 0.9),
    f("thermal.overload", "branch", "LA2", 120, 100),
    { ...f("thermal.near_limit", "branch", "LA1", 95, 90), severity: "warning" },
  ];
  const needs = classifyNeeds(form, findings);
  assertEquals(needs.map((n) => [n.kind, n.needClass]), [
    ["undervoltage", "statutory"],
    ["line_overload", "statutory"],
  ]);
  const under = needs[0]!;
  assertEquals(under.worst.value, 0.885);
  assertEquals(under.worst.caseId, "winter");
  assertEquals(under.evidence.length, 3);
  assertEquals(under.customers, 22); // A1 and A2, A2 counted once
  assertEquals(under.excessPercent, 15); // 0.015 of a 0.10 margin
  // LA2 feeds A2 and what lies beyond it: A2 (12), A3 (0), A4 (3).
  assertEquals(needs[1]!.customers, 15);
  assertEquals(needs[1]!.id, `${form.feederId}/line_overload`);
});
