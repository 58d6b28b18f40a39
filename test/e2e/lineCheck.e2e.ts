/**
 * The straight-line check in a real browser: the form on a demo arm sheet runs the core in Chromium and shows the
 * same largest constant speed as `armdex line` run here with Node (the reference: the CLI's
 * feasibleConstantSpeedMmPerS, src/cli/line.ts), equal within the rounding the page shows; a page opened with the
 * line in its address runs the check without a click; the build-time standard lines agree with the CLI too.
 * No console error, no CSP violation, no failed request. A screenshot goes to test-results/ for a person to look at.
 *
 * PAGE is the arm sheet; ARMDEX_LINE_CHECK_PAGE points the test at another page holding the section (e.g. a
 * preview page while the arm sheet does not include it yet).
 */
import { execFile } from "node:child_process";
import { mkdirSync } from "node:fs";
import { join } from "node:path";
import { promisify } from "node:util";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { launchChromium, openWatched, type WatchedPage } from "./helpers/browser";

const run = promisify(execFile);
const root = new URL("../..", import.meta.url).pathname;
const siteUrl = inject("siteUrl");
const origin = inject("origin");
const shotsDir = join(root, "test-results", "screenshots");

const ARM = "corvell-tern-7";
const PAGE = process.env.ARMDEX_LINE_CHECK_PAGE ?? `arms/${ARM}/`;

interface Line {
  readonly from: string;
  readonly to: string;
  readonly orientation: string;
  readonly speed: string;
}

/** An oblique line whose bottleneck lies inside the line (found by the refinement between samples). */
const FORM_LINE: Line = { from: "500,-350,300", to: "200,300,700", orientation: "down", speed: "800" };
/** A line with roll, pitch, yaw, given through the address. */
const URL_LINE: Line = { from: "500,-350,300", to: "200,300,700", orientation: "180,-20,30", speed: "800" };

interface CliLine {
  readonly feasibleConstantSpeedMmPerS: number | null;
  readonly bottleneck: { readonly joint: string | null; readonly reason: string } | null;
}

/** `armdex line` for the demo arm (tsx on Node: the same core, outside the browser). */
async function cli(line: Line): Promise<CliLine> {
  const args = [
    "tsx",
    "src/cli/armdex.ts",
    "line",
    `arms/${ARM}.json`,
    `--from=${line.from}`,
    `--to=${line.to}`,
    `--orientation=${line.orientation}`,
    `--speed=${line.speed}`,
  ];
  const { stdout } = await run("npx", args, { cwd: root, maxBuffer: 32 * 1024 * 1024 });
  return JSON.parse(stdout) as CliLine;
}

/** "1,536 mm/s" → { value: 1536, decimals: 0 }. */
function shownSpeed(text: string): { value: number; decimals: number } {
  const m = /([\d,]+(?:\.(\d+))?)\s*mm\/s/.exec(text.replace(/\u00a0/g, " "));
  if (!m) throw new Error(`no speed in "${text}"`);
  return { value: Number(m[1]!.replace(/,/g, "")), decimals: m[2]?.length ?? 0 };
}

/** Equal within the display rounding: half a unit of the last digit shown. */
function expectShownEqual(text: string, reference: number): void {
  const { value, decimals } = shownSpeed(text);
  expect(Math.abs(value - reference), `shown "${text}" vs CLI ${reference}`).toBeLessThanOrEqual(
    0.5 * 10 ** -decimals + 1e-9,
  );
}

const query = (line: Line) => new URLSearchParams(Object.entries(line)).toString();

let browser: Browser;
let context: BrowserContext;

beforeAll(async () => {
  mkdirSync(shotsDir, { recursive: true });
  browser = await launchChromium();
  context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
});

afterAll(async () => {
  await context?.close();
  await browser?.close();
});

async function open(path: string): Promise<WatchedPage> {
  const opened = await openWatched(() => context.newPage(), `${siteUrl}${path}`, origin);
  expect(opened.status, `HTTP status of ${siteUrl}${path}`).toBe(200);
  expect(
    await opened.page.locator("#line-check").count(),
    `${path} has no #line-check section: the arm sheet must include <LineCheck> (src/components/LineCheck.astro)`,
  ).toBe(1);
  return opened;
}

async function waitForResult(page: Page): Promise<void> {
  await page.locator('#line-check[data-state="done"], #line-check[data-state="error"]').waitFor({ timeout: 30_000 });
  expect(
    await page.locator("#line-check").getAttribute("data-state"),
    await page.locator("[data-line-status]").innerText(),
  ).toBe("done");
}

describe("straight-line check", () => {
  it("the form runs the core in the browser and shows the CLI's largest constant speed", async () => {
    const reference = await cli(FORM_LINE);
    expect(reference.feasibleConstantSpeedMmPerS, "CLI figure").toBeGreaterThan(0);
    const { page, finish } = await open(PAGE);
    expect(await page.locator("#line-check").getAttribute("data-state"), "the module mounted").toBe("idle");
    const [fx, fy, fz] = FORM_LINE.from.split(","),
      [tx, ty, tz] = FORM_LINE.to.split(",");
    const form = page.locator("form[data-line-form]");
    for (const [name, value] of [
      ["from-x", fx],
      ["from-y", fy],
      ["from-z", fz],
      ["to-x", tx],
      ["to-y", ty],
      ["to-z", tz],
      ["speed", FORM_LINE.speed],
    ] as const) {
      await form.locator(`input[name="${name}"]`).fill(value!);
    }
    await form.locator('select[name="orientation"]').selectOption(FORM_LINE.orientation);
    await form.getByRole("button", { name: "Check the line" }).click();
    await waitForResult(page);

    const feasible = page.locator('[data-line-results] dd[data-key="feasible"]');
    expectShownEqual(await feasible.innerText(), reference.feasibleConstantSpeedMmPerS!);
    // The raw figure too: the same core on the same arm description gives the same number (CLI: 9 significant digits).
    const raw = Number(await feasible.getAttribute("data-value"));
    expect(
      Math.abs(raw - reference.feasibleConstantSpeedMmPerS!) / reference.feasibleConstantSpeedMmPerS!,
    ).toBeLessThan(1e-8);
    expect(await page.locator('[data-line-results] dd[data-key="bottleneck"]').innerText()).toContain(
      reference.bottleneck!.joint!,
    );
    // The chart: one line per driven joint, the limit, the bottleneck marker; built as elements.
    const chart = page.locator("[data-line-results] svg.chart-line-rates");
    expect(await chart.locator("path.lr-joint").count()).toBe(6);
    expect(await chart.locator("line.lr-limit:not(.legend-line)").count()).toBe(1);
    expect(await chart.locator("circle.lr-bottleneck").count()).toBe(1);
    // The address now holds the line.
    const url = new URL(page.url());
    expect([
      url.searchParams.get("from"),
      url.searchParams.get("to"),
      url.searchParams.get("orientation"),
      url.searchParams.get("speed"),
    ]).toEqual([FORM_LINE.from, FORM_LINE.to, FORM_LINE.orientation, FORM_LINE.speed]);
    await page.locator("#line-check").screenshot({ path: join(shotsDir, "line-check.png") });
    expect(await finish()).toEqual([]);
  });

  it("a page opened with the line in its address runs the check without a click", async () => {
    const reference = await cli(URL_LINE);
    const { page, finish } = await open(`${PAGE}?${query(URL_LINE)}#line-check`);
    await waitForResult(page);
    expectShownEqual(
      await page.locator('[data-line-results] dd[data-key="feasible"]').innerText(),
      reference.feasibleConstantSpeedMmPerS!,
    );
    const form = page.locator("form[data-line-form]");
    expect(await form.locator('select[name="orientation"]').inputValue()).toBe("rpy");
    expect(await form.locator('input[name="pitch"]').inputValue()).toBe("-20");
    expect(await form.locator('input[name="from-y"]').inputValue()).toBe("-350");
    expect(await page.locator("[data-line-rpy]").isVisible()).toBe(true);
    expect(await finish()).toEqual([]);
  });

  it("the standard lines, checked at build time, agree with the CLI", async () => {
    const { page, finish } = await open(PAGE);
    const figures = page.locator("figure.line-standard");
    expect(await figures.count()).toBe(3);
    const first = figures.first();
    expect(await first.locator("svg.chart-line-rates path.lr-joint").count()).toBe(6);
    const href = (await first.locator("a[data-line-load]").getAttribute("href")) ?? "";
    const params = new URL(href, page.url()).searchParams;
    const line: Line = {
      from: params.get("from")!,
      to: params.get("to")!,
      orientation: params.get("orientation")!,
      speed: params.get("speed")!,
    };
    const reference = await cli(line);
    expectShownEqual(
      await first.locator('dd[data-key="feasible"]').innerText(),
      reference.feasibleConstantSpeedMmPerS!,
    );
    // Following the link loads the line into the form and runs it: the browser agrees with the build.
    await first.locator("a[data-line-load]").click();
    await page.waitForURL((u) => u.searchParams.get("from") === line.from);
    await waitForResult(page);
    expectShownEqual(
      await page.locator('[data-line-results] dd[data-key="feasible"]').innerText(),
      reference.feasibleConstantSpeedMmPerS!,
    );
    expect(await finish()).toEqual([]);
  });

  it("reports a line it cannot read instead of failing silently", async () => {
    const { page, finish } = await open(`${PAGE}?from=1,2&to=3,4,5&orientation=sideways&speed=-1`);
    await page.locator('#line-check[data-state="error"]').waitFor();
    const status = await page.locator("[data-line-status]").innerText();
    for (const part of ["from:", "orientation:", "speed:"]) expect(status).toContain(part);
    expect(await finish()).toEqual([]);
  });
});

describe("straight-line check side by side", () => {
  it("/compare/?arms=… checks one line for every chosen arm, each figure equal to the CLI's", async () => {
    // Reference: `armdex line` per arm (the same core in Node); the page reads the arms and the line from its address.
    const line: Line = { from: "400,-300,300", to: "400,300,300", orientation: "down", speed: "800" };
    const ids = ["corvell-tern-7", "corvell-tern-25"];
    const references = await Promise.all(
      ids.map(async (id) => {
        const args = [
          "tsx",
          "src/cli/armdex.ts",
          "line",
          `arms/${id}.json`,
          `--from=${line.from}`,
          `--to=${line.to}`,
          `--orientation=${line.orientation}`,
          `--speed=${line.speed}`,
        ];
        const { stdout } = await run("npx", args, { cwd: root, maxBuffer: 32 * 1024 * 1024 });
        return (JSON.parse(stdout) as CliLine).feasibleConstantSpeedMmPerS!;
      }),
    );
    const { page, finish } = await open(`compare/?arms=${ids.join(",")}&${query(line)}`);
    await waitForResult(page);
    const text = await page.locator("[data-line-results]").innerText();
    for (const [i, id] of ids.entries()) {
      const model = id === "corvell-tern-7" ? "Tern 7" : "Tern 25";
      const row = page.locator("[data-line-results] tr", { hasText: model }).first();
      expect(text, `${id} listed`).toContain(model);
      expectShownEqual(await row.innerText(), references[i]!);
    }
    await page.screenshot({ path: join(shotsDir, "compare-line-check.png"), fullPage: true });
    expect(await finish()).toEqual([]);
  });
});
