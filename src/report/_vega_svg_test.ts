import { ok as assert, strictEqual } from "node:assert/strict";
import { renderVegaLiteSvg, scopeSvgIds } from "./_vega_svg.ts";

Deno.test("scopeSvgIds() renumbers ids and their uses under the prefix", () => {
  const svg = '<svg><clipPath id="clip7"/><g clip-path="url(#clip7)"/><use href="#clip7"/>' +
    '<path id="p3"/><g clip-path="url(#other)"/></svg>';
  strictEqual(
    scopeSvgIds(svg, "f-vp"),
    '<svg><clipPath id="f-vp-1"/><g clip-path="url(#f-vp-1)"/><use href="#f-vp-1"/>' +
      '<path id="f-vp-2"/><g clip-path="url(#other)"/></svg>',
  );
});

Deno.test("renderVegaLiteSvg() gives the same SVG however many charts came before", async () => {
  const spec = {
    width: 120,
    height: 80,
    data: { values: [{ a: 1, b: 2 }, { a: 3, b: 1 }] },
    mark: { type: "line" as const, clip: true },
    encoding: {
      x: { field: "a", type: "quantitative" as const },
      y: { field: "b", type: "quantitative" as const },
    },
  };
  const first = await renderVegaLiteSvg(spec, "t1");
  await renderVegaLiteSvg(spec, "t2");
  strictEqual(await renderVegaLiteSvg(spec, "t1"), first);
  assert(first.startsWith("<svg") && first.includes('id="t1-1"'));
  assert(first.includes('font-family="sans-serif"'));
});
