/**
 * Opens a report.html in headless Chromium, works its controls and reports what it saw as
 * JSON on stdout; tests/report_browser_test.ts runs it as a separate process and asserts.
 *
 *   deno run <permissions> tests/report_browser_driver.ts <report.html> <screenshot.png>
 *
 * A process of its own because playwright-core needs what the test suite does not grant:
 * its bundled `debug` module lists every environment variable when imported (so
 * --allow-env without a list), and it asks for the home directory and the OS release.
 * Chromium gets TMPDIR as its home, so its profile and caches stay under reports/; the run
 * permission is unscoped so that playwright can kill Chromium's process group if a launch
 * goes wrong (the test task has the same).
 */
import { chromium } from "playwright-core";

export interface BrowserObservations {
  readonly consoleErrors: readonly string[];
  readonly pageErrors: readonly string[];
  readonly failedRequests: readonly string[];
  /** Requests for anything but the report file itself (all refused). */
  readonly outsideRequests: readonly string[];
  readonly title: string;
  /** Rank column of the ranking table's visible rows, top to bottom, after each step. */
  readonly ranksAtLoad: readonly string[];
  readonly ranksByCostAscending: readonly string[];
  readonly ranksByCostDescending: readonly string[];
  readonly ranksByFeeder: readonly string[];
  readonly ranksFilteredByText: readonly string[];
  readonly countFilteredByText: string;
  readonly ranksFilteredByClass: readonly string[];
  /** The feeder sections and the size of each SVG they hold. */
  readonly feederSections: readonly {
    readonly id: string;
    readonly svgs: readonly { readonly width: number; readonly height: number }[];
  }[];
  /** Whether a link in the fleet table brought its feeder section into view. */
  readonly linkScrolledToFeeder: boolean;
}

// The few DOM shapes the page functions use (the suite is type-checked without the DOM lib).
interface Row {
  readonly cells: readonly { readonly textContent: string | null }[];
}
interface Boxed {
  getBoundingClientRect(): {
    readonly top: number;
    readonly width: number;
    readonly height: number;
  };
}
interface Viewport {
  readonly innerHeight: number;
  scrollTo(x: number, y: number): void;
}

const ARGS = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
];

export async function browseReport(
  htmlPath: string,
  screenshotPath: string,
): Promise<BrowserObservations> {
  const url = new URL(`file://${Deno.realPathSync(htmlPath)}`).href;
  const tmp = Deno.env.get("TMPDIR");
  // Chromium puts a Unix socket in its temporary folder, and a socket path is limited to
  // 107 bytes: under a deep checkout, its temporary folder goes back to /tmp.
  const chromiumTmp = tmp !== undefined && tmp.length <= 60 ? tmp : "/tmp";
  const env = tmp === undefined ? undefined : {
    ...Deno.env.toObject(),
    TMPDIR: chromiumTmp,
    HOME: tmp,
    XDG_CONFIG_HOME: tmp,
    XDG_CACHE_HOME: tmp,
  };
  const browser = await chromium.launch({
    executablePath: "/usr/bin/chromium",
    args: ARGS,
    ...(env === undefined ? {} : { env }),
  });
  try {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    const consoleErrors: string[] = [];
    const pageErrors: string[] = [];
    const failedRequests: string[] = [];
    const outsideRequests: string[] = [];
    page.on("console", (m) => {
      if (m.type() === "error" || m.type() === "warning") consoleErrors.push(m.text());
    });
    page.on("pageerror", (e) => pageErrors.push(e.message));
    page.on("requestfailed", (r) => failedRequests.push(`${r.url()}: ${r.failure()?.errorText}`));
    await page.route("**/*", (route) => {
      if (route.request().url() === url) return route.continue();
      outsideRequests.push(route.request().url());
      return route.abort();
    });
    await page.goto(url, { waitUntil: "load" });

    const ranks = () =>
      page.$$eval(
        "#ranking-table tbody tr:not([hidden])",
        (rows) => rows.map((r) => (r as unknown as Row).cells[0]!.textContent!.trim()),
      );
    const header = (label: string) =>
      page.locator("#ranking-table thead button", { hasText: label }).first();
    const ranksAtLoad = await ranks();
    await header("Indicative cost").click();
    const ranksByCostAscending = await ranks();
    await header("Indicative cost").click();
    const ranksByCostDescending = await ranks();
    await header("Feeder").click();
    const ranksByFeeder = await ranks();
    await header("Rank").click();

    await page.fill("#ranking-filter", "k7");
    const ranksFilteredByText = await ranks();
    const countFilteredByText = (await page.textContent('[data-count-for="ranking-table"]')) ?? "";
    await page.fill("#ranking-filter", "");
    await page.selectOption("#ranking-class", "planning");
    const ranksFilteredByClass = await ranks();
    await page.selectOption("#ranking-class", "");

    const feederSections = await page.$$eval("section.feeder", (sections) =>
      sections.map((s) => ({
        id: s.id,
        svgs: Array.from(s.querySelectorAll(":scope svg:not([aria-hidden])")).map((svg) => {
          const box = (svg as unknown as Boxed).getBoundingClientRect();
          return { width: Math.round(box.width), height: Math.round(box.height) };
        }),
      })));

    const firstId = feederSections[0]?.id;
    let linkScrolledToFeeder = false;
    if (firstId !== undefined) {
      await page.locator(`#fleet-table a[href="#${firstId}"]`).click();
      linkScrolledToFeeder = await page.$eval(`#${firstId}`, (s) => {
        const top = (s as unknown as Boxed).getBoundingClientRect().top;
        return top >= -1 && top < (globalThis as unknown as Viewport).innerHeight / 2;
      });
      await page.evaluate(() => (globalThis as unknown as Viewport).scrollTo(0, 0));
    }
    await page.screenshot({ path: screenshotPath, fullPage: true });
    return {
      consoleErrors,
      pageErrors,
      failedRequests,
      outsideRequests,
      title: await page.title(),
      ranksAtLoad,
      ranksByCostAscending,
      ranksByCostDescending,
      ranksByFeeder,
      ranksFilteredByText,
      countFilteredByText,
      ranksFilteredByClass,
      feederSections,
      linkScrolledToFeeder,
    };
  } finally {
    await browser.close();
  }
}

if (import.meta.main) {
  const [htmlPath, screenshotPath] = Deno.args;
  if (htmlPath === undefined || screenshotPath === undefined) {
    throw new Error("Usage: report_browser_driver.ts <report.html> <screenshot.png>");
  }
  const seen = await browseReport(htmlPath, screenshotPath);
  await Deno.stdout.write(new TextEncoder().encode(JSON.stringify(seen) + "\n"));
}
