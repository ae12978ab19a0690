import { strictEqual } from "node:assert/strict";
import { escapeHtml, html, raw } from "./_html.ts";
import { feederAnchor } from "./_feeder_anchor.ts";
import { formatMoney, formatNumber } from "./_number_text.ts";

Deno.test("escapeHtml() replaces the five characters that can end text or an attribute", () => {
  strictEqual(escapeHtml(`a<b>&"c'`), "a&lt;b&gt;&amp;&quot;c&#39;");
  strictEqual(escapeHtml("plain – text"), "plain – text");
});

Deno.test("html() escapes values, keeps Html as it is, flattens arrays and drops empty values", () => {
  const id = "<F1>";
  strictEqual(
    html`<td title="${id}">${id}${raw("<b>x</b>")}${[1, "&", [null, false]]}${undefined}</td>`
      .__html,
    '<td title="&lt;F1&gt;">&lt;F1&gt;<b>x</b>1&amp;</td>',
  );
});

Deno.test("feederAnchor() gives distinct, id-safe anchors for ids that differ only in odd characters", () => {
  const ids = ["F1", "F_1", "F 1", "F<1>", "F&1", 'F"1', "F'1", "F-1", "f1", "Ä1", "F_5f_1"];
  const anchors = ids.map(feederAnchor);
  strictEqual(new Set(anchors).size, ids.length);
  for (const a of anchors) strictEqual(/^feeder-[A-Za-z0-9_-]+$/.test(a), true, a);
  strictEqual(feederAnchor("MOR-L1"), "feeder-MOR-L1");
  strictEqual(feederAnchor("F_1"), "feeder-F_5f_1");
});

Deno.test("formatNumber() rounds, groups thousands and never depends on the locale", () => {
  const cases: [number | null | undefined, number, string][] = [
    [1234567.891, 2, "1,234,567.89"],
    [999.5, 0, "1,000"],
    [-12345, 0, "-12,345"],
    [-0.0001, 2, "0.00"],
    [0.9, 3, "0.900"],
    [null, 2, "–"],
    [undefined, 0, "–"],
    [Infinity, 0, "–"],
    [NaN, 1, "–"],
  ];
  for (const [v, d, s] of cases) strictEqual(formatNumber(v, d), s, `${v}`);
  strictEqual(formatMoney(97000, "NVC"), "NVC 97,000");
  strictEqual(formatMoney(4.4, "k-NVK"), "k-NVK 4.4");
  strictEqual(formatMoney(322, "k-NVK"), "k-NVK 322");
  strictEqual(formatMoney(0.125, "k-NVK"), "k-NVK 0.13");
  strictEqual(formatMoney(999.999, "k-NVK"), "k-NVK 1,000");
  strictEqual(formatMoney(null, "NVC"), "–");
});
