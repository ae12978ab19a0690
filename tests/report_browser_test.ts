/**
 * The HTML report in a real browser: built from the hand-made Norvessa fixture, written to
 * reports/report_browser/report.html, opened in headless Chromium (by
 * tests/report_browser_driver.ts in a process of its own), its ranking sorted and filtered,
 * its feeder pages and charts measured, and a screenshot kept as
 * reports/report_screenshot.png. Skipped, with the reason printed, when /usr/bin/chromium
 * is absent.
 */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { reportFixture } from "./fixtures/report_fixtures.ts";
import { renderFeederPage, renderReportHead, renderReportTail } from "../src/report/report_html.ts";
import type { BrowserObservations } from "./report_browser_driver.ts";

const CHROMIUM = "/usr/bin/chromium";
const DIR = "reports/report_browser";
const SCREENSHOT = "reports/report_screenshot.png";

function hasChromium(): boolean {
  try {
    return Deno.statSync(CHROMIUM).isFile;
  } catch {
    return false;
  }
}

const present = hasChromium();
if (!present) {
  console.log(
    `report_browser_test: skipped, ${CHROMIUM} not found (install the Debian package ` +
      `"chromium"; .ci/run does so when it can).`,
  );
}

/**
 * Permissions of the driver process: what playwright-core needs, nothing more. The env
 * permission is unlisted because playwright-core's bundled `debug` module enumerates the
 * whole environment when imported; the test task itself keeps its short list.
 */
const DRIVER_PERMISSIONS = [
  "--allow-read",
  "--allow-write=reports",
  "--allow-env",
  "--allow-sys=homedir,osRelease",
  // Unscoped like the test task's: playwright kills Chromium's process group on a failed
  // launch, which Deno allows only with run access to everything.
  "--allow-run",
];

async function browse(htmlPath: string): Promise<BrowserObservations> {
  const tmp = `${Deno.cwd()}/${DIR}/tmp`;
  await Deno.mkdir(tmp, { recursive: true });
  try {
    const out = await new Deno.Command(Deno.execPath(), {
      args: [
        "run",
        "--cached-only",
        ...DRIVER_PERMISSIONS,
        "tests/report_browser_driver.ts",
        htmlPath,
        SCREENSHOT,
      ],
      env: {
        // Playwright's temporary files and Chromium's profile and home go under reports/.
        TMPDIR: tmp,
        // playwright-core probes /proc/sys at import to detect WSL; Deno lets only a fully
        // privileged process read there. This switch of its own defers the probe; the
        // answer is used only to open a desktop browser, which the driver never does.
        __IS_WSL_TEST__: "1",
      },
      stdout: "piped",
      stderr: "piped",
    }).output();
    const err = new TextDecoder().decode(out.stderr);
    if (out.code !== 0) throw new Error(`The browser driver exited ${out.code}: ${err}`);
    return JSON.parse(new TextDecoder().decode(out.stdout));
  } finally {
    await Deno.remove(tmp, { recursive: true }).catch(() => {});
  }
}

Deno.test({
  name: "renderReportHead() and renderFeederPage() make a report that works in Chromium",
  ignore: !present,
  async fn() {
    const { ctx, files } = reportFixture();
    let html = await renderReportHead(ctx);
    for (const f of files) html += await renderFeederPage(f, ctx);
    html += renderReportTail(ctx);
    await Deno.mkdir(DIR, { recursive: true });
    const path = `${DIR}/report.html`;
    await Deno.writeTextFile(path, html);

    const seen = await browse(path);
    assertEquals(seen.consoleErrors, []);
    assertEquals(seen.pageErrors, []);
    assertEquals(seen.failedRequests, []);
    assertEquals(seen.outsideRequests, []);
    assertEquals(seen.title, "Screening report: data-samples/norvessa (nightly)");

    // The ranking table with its rows; header clicks sort (numbers as numbers, blanks
    // last, a second click reverses); the text box and the class select filter.
    assertEquals(seen.ranksAtLoad, ["1", "2", "3"]);
    assertEquals(seen.ranksByCostAscending, ["1", "3", "2"]);
    assertEquals(seen.ranksByCostDescending, ["3", "1", "2"]);
    // Stable: the two SKR-F1 needs keep the order the cost sort left them in.
    assertEquals(seen.ranksByFeeder, ["3", "1", "2"]);
    assertEquals(seen.ranksFilteredByText, ["2"]);
    assertEquals(seen.countFilteredByText, "1 of 3 shown");
    assertEquals(seen.ranksFilteredByClass, ["3"]);

    // Both feeder pages, each chart drawn with a real size.
    assertEquals(seen.feederSections.map((s) => s.id), ["feeder-SKR-F1", "feeder-SKR-K7"]);
    const f1 = seen.feederSections[0]!;
    assertEquals(f1.svgs.length, 3, "voltage profile, schematic, time–current plot");
    for (const s of f1.svgs) assert(s.width > 200 && s.height > 40, JSON.stringify(s));
    assertEquals(seen.feederSections[1]!.svgs.length, 2, "voltage profile and schematic");
    assert(seen.linkScrolledToFeeder, "the fleet table's link did not reach the feeder page");

    const shot = await Deno.stat(SCREENSHOT);
    assert(shot.isFile && shot.size > 10_000);
  },
});
