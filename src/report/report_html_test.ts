/** The single-file HTML report: structure, escaping, determinism, no outside references. */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { renderFeederPage, renderReportHead, renderReportTail } from "./report_html.ts";
import { CAUTION } from "./run_files.ts";
import type { FeederFile } from "./feeder_file.ts";
import type { ReportContext } from "./report_context.ts";
import { reportFixture } from "../../tests/fixtures/report_fixtures.ts";
import { escapeHtml } from "./_html.ts";

async function wholeReport(ctx: ReportContext, files: readonly FeederFile[]): Promise<string> {
  let out = await renderReportHead(ctx);
  for (const f of files) out += await renderFeederPage(f, ctx);
  return out + renderReportTail(ctx);
}

const count = (text: string, re: RegExp) => [...text.matchAll(re)].length;

/** The rows of a table's body, by the table's id. */
function bodyRows(page: string, tableId: string): string[] {
  const start = page.indexOf(`<table id="${tableId}"`);
  assert(start >= 0, `table ${tableId} missing`);
  const body = page.slice(page.indexOf("<tbody>", start), page.indexOf("</tbody>", start));
  return body.split("<tr").slice(1);
}

Deno.test("renderReportHead() opens the document with provenance, the caution and the fleet overview", async () => {
  const { ctx } = reportFixture();
  const head = await renderReportHead(ctx);
  assert(head.startsWith("<!doctype html>"));
  assert(head.includes('<meta charset="utf-8">'));
  assert(head.includes("<title>Screening report: data-samples/norvessa (nightly)</title>"));
  for (
    const v of [
      "gridtriage 0.1.0",
      "data-samples/norvessa",
      "pipelines/nightly.json",
      ctx.run.inputHash,
      ctx.run.configHash,
      "2026-03-02T01:00:00.000Z",
      "2026-03-02T01:00:04.250Z",
      "5: 4 studied, 1 failed, 0 set aside",
      "Norvessa unit cost table 2026 (invented)",
    ]
  ) assert(head.includes(v), `provenance lacks ${v}`);
  assert(head.includes(CAUTION));
  assert(head.includes("@media print"));
  const ranking = bodyRows(head, "ranking-table");
  assertEquals(ranking.length, 3);
  assert(ranking[0]!.includes('data-class="statutory"') && ranking[0]!.includes("NVC 3,000"));
  assertEquals(bodyRows(head, "fleet-table").length, 5);
  assert(head.includes('<a href="#feeder-SKR-K7">SKR-K7</a>'));
  // Two fleet charts rendered as inline SVG.
  assertEquals(count(head, /<svg /g), 2);
});

Deno.test("renderReportHead() carries the sort and filter script and its hooks", async () => {
  const { ctx } = reportFixture();
  const head = await renderReportHead(ctx);
  assert(head.includes('<table id="ranking-table" data-sortable>'));
  assert(head.includes('data-filter-for="ranking-table"'));
  assert(head.includes('data-filter-attr="class"'));
  for (const c of ["safety", "statutory", "planning", "hosting"]) {
    assert(head.includes(`<option value="${c}">${c}</option>`));
  }
  assert(head.includes('addEventListener("click"'));
  assert(head.includes("aria-sort"));
  assertEquals(count(head, /<th scope="col"[^>]*><button type="button">/g), 8 + 12);
});

Deno.test("renderReportHead() leaves out the times of a run given without them", async () => {
  const { ctx } = reportFixture();
  const { startedAt: _s, finishedAt: _f, ...run } = ctx.run;
  const head = await renderReportHead({ ...ctx, run });
  assert(!head.includes("<dt>Started</dt>") && !head.includes("finished"));
  assert(head.includes("<dt>Input hash</dt>"));
});

Deno.test("renderFeederPage() gives one section with every part of the feeder page", async () => {
  const { ctx, files } = reportFixture();
  const page = await renderFeederPage(files[0]!, ctx);
  assert(page.includes('<section class="feeder" id="feeder-SKR-F1"'));
  for (
    const h of [
      "Key figures",
      "Needs",
      "Generation headroom",
      "Recovery after faults",
      "Voltage profile",
      "Schematic",
      "Protection: time–current curves",
      "Findings",
    ]
  ) assert(page.includes(`<h3>${h}</h3>`), `missing ${h}`);
  // Voltage profile, schematic and time–current plot.
  assertEquals(count(page, /<svg /g), 3);
  assert(page.includes('class="schematic"'));
  assert(page.includes("Per-bus hosting capacity is not part of this run."));
  assert(page.includes("Fault currents are not computed in this run"));
  assert(page.includes("NVC 97,000") && page.includes("Line voltage regulator, 20 kV, 200 A"));
  assert(page.includes("SKR-F1-R4 · R-F1-R4 · phase · fast"));
  assert(page.includes("SKR-F1-FU5 · EXP-40"));
  assert(page.includes("1.10 pu (MV)"));
  assert(page.includes("Below the band") && page.includes("Above the band"));
});

Deno.test("renderFeederPage() says plainly what a feeder without devices or headroom lacks", async () => {
  const { ctx, files } = reportFixture();
  const page = await renderFeederPage(files[1]!, ctx);
  assert(page.includes("No protective device with time–current settings on this feeder."));
  assert(page.includes("generation headroom was not computed in this run"));
  assert(page.includes("none in the catalogue removes this need"));
  assert(page.includes("tap setpoint: The transformer tap is already at its end stop."));
  assert(page.includes("0.90 pu (LV)"));
});

Deno.test("renderFeederPage() shows a failed feeder without charts", async () => {
  const { ctx, files } = reportFixture();
  const failed: FeederFile = {
    ...files[1]!,
    feederId: "SKR-F4",
    status: "failed",
    failure: "the worker stopped answering",
    cases: [],
    needs: [],
    devices: [],
  };
  const page = await renderFeederPage(failed, ctx);
  assert(page.includes("The study of this feeder failed: the worker stopped answering."));
  assertEquals(count(page, /<svg /g), 0);
  assert(page.includes("No case has bus results to draw."));
});

Deno.test("renderReportTail() closes the document with the caution", () => {
  const { ctx } = reportFixture();
  const tail = renderReportTail(ctx);
  assert(tail.includes(CAUTION));
  assert(tail.trimEnd().endsWith("</html>"));
  assert(tail.indexOf("</section>") < tail.indexOf("</main>"));
});

Deno.test("renderReportHead() and renderFeederPage() escape ids and text into HTML", async () => {
  const nasty = `KV<7>&"x'`;
  const { ctx, files } = reportFixture(nasty);
  const page = await wholeReport(ctx, files);
  assert(!page.includes(nasty) && !page.includes("KV<7>"));
  assert(page.includes(escapeHtml(nasty)));
  assert(page.includes("KV&lt;7&gt;&amp;&quot;x&#39;"));
  // The anchor is id-safe and the links point at it.
  assert(page.includes('id="feeder-KV_3c_7_3e__26__22_x_27_"'));
  // Two ranking rows and one fleet row link to it.
  assertEquals(count(page, /href="#feeder-KV_3c_7_3e__26__22_x_27_"/g), 3);
  // Only the report's own markup opens elements: every "<" starts a tag or a comment.
  assert(!/<(?![a-zA-Z/!])/.test(page.replace(/<script>[\s\S]*?<\/script>/, "")));
});

Deno.test("renderReportHead() and renderFeederPage() give the same text for the same input", async () => {
  const { ctx, files } = reportFixture();
  const first = await wholeReport(ctx, files);
  // Charts rendered in between move vega's global id counter; the text must not change.
  await wholeReport(...Object.values(reportFixture("OTHER")) as [ReportContext, FeederFile[]]);
  const second = await wholeReport(ctx, files);
  assert(first === second, "two renderings differ");
});

Deno.test("renderReportHead() and renderFeederPage() make a document that fetches nothing and repeats no id", async () => {
  const { ctx, files } = reportFixture();
  const page = await wholeReport(ctx, files);
  assert(!/\bsrc=/.test(page), "an element loads a source");
  assert(!/<link\b/.test(page), "a stylesheet or icon is linked");
  assert(!/url\((?!#)/.test(page), "CSS or SVG refers to an outside url()");
  assert(!/@import|@font-face/.test(page));
  for (const m of page.matchAll(/href="([^"]*)"/g)) {
    assert(m[1]!.startsWith("#") || m[1] === "http://www.w3.org/2000/svg", `link ${m[1]}`);
  }
  const ids = [...page.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]!);
  assertEquals(ids.length, new Set(ids).size, "an id appears twice");
  // Every internal link has its target, but for the fleet rows whose files the fixture
  // leaves out.
  const withoutPage = ["feeder-SKR-F2", "feeder-SKR-F3", "feeder-SKR-F4"];
  for (const m of page.matchAll(/href="#([^"]+)"/g)) {
    assert(ids.includes(m[1]!) || withoutPage.includes(m[1]!), `no target for #${m[1]}`);
  }
});
