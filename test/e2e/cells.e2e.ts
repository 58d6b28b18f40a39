/**
 * Cell studies in a real browser. The study page of a demo cell shows the ranking with a link to each candidate's
 * sheet (and those sheets exist), its drawings, time bars and placement maps, and prints without navigation or
 * downloads; its downloads exist, and the study JSON is exactly what `armdex cell` prints for the same files here
 * with Node (the reference: src/cli/cell.ts), the placement map of one arm what `armdex place` prints. The editor
 * opened with `?cell=<id>` recomputes the study in Chromium and shows the same verdicts and cycle times as the JSON;
 * a change goes into the address and a page opened with that address restores it; the side-by-side page links the
 * studies of its arms and starts the editor with them. No console error, CSP violation or failed request anywhere.
 * Screenshots go to test-results/screenshots/ for a person to look at.
 */
import { execFile } from "node:child_process";
import { mkdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { promisify } from "node:util";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { launchChromium, openWatched, type WatchedPage } from "./helpers/browser";

const run = promisify(execFile);
const root = new URL("../..", import.meta.url).pathname;
const siteUrl = inject("siteUrl");
const origin = inject("origin");
const shotsDir = join(root, "test-results", "screenshots");

const CELL = "demo-press-tending";
const CELL_FILE = `arms/cells/${CELL}.json`;
const cellFile = JSON.parse(readFileSync(join(root, CELL_FILE), "utf8")) as { candidates: string[] };

interface StudyJson {
  cell: string;
  arms: { arm: string; verdict: string; cycleTimeS: number | null; moves: unknown[]; targets: unknown[] }[];
}

/** `armdex <args>` with tsx on Node: the command line's output, the reference for the published files. */
async function cli(...args: string[]): Promise<string> {
  const { stdout } = await run("npx", ["tsx", "src/cli/armdex.ts", ...args], {
    cwd: root,
    maxBuffer: 64 * 1024 * 1024,
  });
  return stdout;
}

let browser: Browser;

let published: StudyJson;

beforeAll(async () => {
  mkdirSync(shotsDir, { recursive: true });
  browser = await launchChromium();
  published = (await (await fetch(`${siteUrl}data/cells/${CELL}.json`)).json()) as StudyJson;
});

afterAll(async () => {
  await browser?.close();
});

async function open(path: string): Promise<WatchedPage> {
  const opened = await openWatched(
    () => browser.newPage({ viewport: { width: 1280, height: 900 } }),
    `${siteUrl}${path}`,
    origin,
  );
  expect(opened.status, `HTTP status of /${path}`).toBe(200);
  return opened;
}

/** Waits until the editor has finished its `runs`-th recomputation (or reports another state). */
async function editorDone(page: Page, runs: number): Promise<void> {
  await page.waitForFunction(
    (n) => {
      const el = document.querySelector<HTMLElement>("[data-cell-editor]");
      return (el?.dataset.state === "done" && Number(el.dataset.runs ?? 0) >= n) || el?.dataset.state === "error";
    },
    runs,
    { timeout: 60_000 },
  );
  expect(
    await page.locator("[data-cell-editor]").getAttribute("data-state"),
    await page.locator("[data-editor-status]").innerText(),
  ).toBe("done");
}

/** Rows of a ranking table: arm, verdict, cycle time as the row's data says. */
function rankingRows(page: Page, table: string) {
  return page.$$eval(`${table} tbody tr`, (rows) =>
    rows.map((r) => ({
      arm: (r as HTMLElement).dataset.key ?? "",
      verdict: (r as HTMLElement).dataset.verdict ?? "",
      cycleS: (r as HTMLElement).dataset.cycleS ?? null,
      href: r.querySelector("a")?.getAttribute("href") ?? null,
    })),
  );
}

const expected = (study: StudyJson) =>
  study.arms.map((a) => ({
    arm: a.arm,
    verdict: a.verdict,
    cycleS: a.cycleTimeS === null ? null : String(a.cycleTimeS),
  }));

describe("cell study page", () => {
  it("shows the ranking with a link to each candidate's sheet, the drawings, time bars and placement maps", async () => {
    const { page, finish } = await open(`cells/${CELL}/`);
    const rows = await rankingRows(page, "#cell-ranking");
    expect(rows.map((r) => r.arm).sort()).toEqual([...cellFile.candidates].sort());
    expect(rows.map(({ arm, verdict, cycleS }) => ({ arm, verdict, cycleS }))).toEqual(expected(published));
    for (const r of rows) {
      expect(r.href, `sheet link of ${r.arm}`).toMatch(new RegExp(`/arms/${r.arm}/$`));
      expect((await fetch(`${origin}${r.href}`)).status, `${r.href}`).toBe(200);
      expect(await page.locator(`#arm-${r.arm} svg.chart-cell-time`).count(), `time bar of ${r.arm}`).toBe(1);
      expect(await page.locator(`#arm-${r.arm} svg.chart-placement`).count(), `placement map of ${r.arm}`).toBe(1);
    }
    expect(await page.locator("#layout svg.chart-cell-layout").count()).toBe(2);
    expect(await page.locator("#assumptions").innerText()).toMatch(/no payload dynamics.*no blending/s);
    expect(await page.locator("#cautions").innerText()).toMatch(/ISO 10218-1.*ISO 12100.*ISO\/TS 15066/s);
    await page.screenshot({ path: join(shotsDir, `cell-${CELL}.png`), fullPage: true });
    await page.emulateMedia({ media: "print" });
    expect(await page.locator(".site-header").isVisible()).toBe(false);
    expect(await page.locator("#downloads").isVisible()).toBe(false);
    expect(await page.locator("#layout svg.chart").first().isVisible()).toBe(true);
    expect(await finish()).toEqual([]);
  });

  it("is listed on /cells/, which the site navigation links", async () => {
    const { page, finish } = await open("");
    await page.locator(".site-nav a", { hasText: "Cell studies" }).click();
    await page.waitForURL(/\/cells\/$/);
    expect(await page.locator(`#cell-studies tbody tr[data-key="${CELL}"] a`).first().getAttribute("href")).toMatch(
      new RegExp(`/cells/${CELL}/$`),
    );
    expect(await finish()).toEqual([]);
  });

  it(
    "publishes the study exactly as `armdex cell` prints it, and the other downloads",
    { timeout: 180_000 },
    async () => {
      const text = await (await fetch(`${siteUrl}data/cells/${CELL}.json`)).text();
      expect(text).toBe(await cli("cell", CELL_FILE));
      const study = JSON.parse(text) as StudyJson;

      const maps = (await (await fetch(`${siteUrl}data/cells/${CELL}/placements.json`)).json()) as { arm: string }[];
      expect(maps.map((m) => m.arm)).toEqual(cellFile.candidates);
      const arm = "corvell-tern-12";
      expect(maps.find((m) => m.arm === arm)).toEqual(JSON.parse(await cli("place", CELL_FILE, "--arm", arm)));

      const lines = (href: string) =>
        fetch(`${siteUrl}${href}`).then(async (r) => (await r.text()).split("\r\n").filter(Boolean));
      const moves = study.arms.reduce((n, a) => n + a.moves.length, 0);
      const targets = study.arms.reduce((n, a) => n + a.targets.length, 0);
      expect(await lines(`data/cells/${CELL}/moves.csv`)).toHaveLength(1 + moves);
      expect(await lines(`data/cells/${CELL}/targets.csv`)).toHaveLength(1 + targets);
      expect(await (await fetch(`${siteUrl}data/cells/${CELL}/cell.json`)).text()).toBe(
        readFileSync(join(root, CELL_FILE), "utf8"),
      );
    },
  );
});

describe("cell editor", () => {
  it("recomputes a published study in the browser with the same verdicts and cycle times", async () => {
    const { page, finish } = await open(`cells/edit/?cell=${CELL}`);
    await editorDone(page, 1);
    expect(
      await rankingRows(page, "#edit-ranking-table").then((r) =>
        r.map(({ arm, verdict, cycleS }) => ({ arm, verdict, cycleS })),
      ),
    ).toEqual(expected(published));
    expect(await page.locator("[data-editor-results] svg.chart-cell-time").count()).toBe(
      1 + cellFile.candidates.length,
    );
    expect(await finish()).toEqual([]);
  });

  it("keeps a change in the address: a page opened with it restores the cell and the results", async () => {
    const first = await open(`cells/edit/?cell=${CELL}`);
    await editorDone(first.page, 1);
    const field = first.page.locator('input[data-path="requirements.maxCycleS"]');
    // A value that is not a number is shown as an error next to the field, and nothing is recomputed.
    await field.fill("fast");
    await first.page.waitForFunction(
      () => document.querySelector<HTMLElement>("[data-cell-editor]")?.dataset.state === "invalid",
    );
    expect(await first.page.locator('[data-errors-for="requirements.maxCycleS"]').innerText()).toMatch(
      /expected number/,
    );
    expect(await field.getAttribute("aria-invalid")).toBe("true");
    // A required cycle between the first and the second arm's cycle times leaves one passing arm.
    const [a, b] = published.arms.filter((x) => x.verdict === "pass").map((x) => x.cycleTimeS!);
    const limit = Number(((a! + b!) / 2).toFixed(3));
    await field.fill(String(limit));
    await editorDone(first.page, 2);
    const changed = await rankingRows(first.page, "#edit-ranking-table");
    expect(changed.filter((r) => r.verdict === "pass")).toHaveLength(1);
    const url = first.page.url();
    expect(url).toMatch(/#state=[A-Za-z0-9_-]+$/);
    await first.page.screenshot({ path: join(shotsDir, "cell-editor.png") });
    expect(await first.finish()).toEqual([]);

    const second = await open(`cells/edit/${new URL(url).hash}`);
    await editorDone(second.page, 1);
    expect(await second.page.locator('input[data-path="requirements.maxCycleS"]').inputValue()).toBe(String(limit));
    expect(await rankingRows(second.page, "#edit-ranking-table")).toEqual(changed);
    expect(await second.finish()).toEqual([]);
  });

  it("is reached from the side-by-side page with its arms, which also lists their cell studies", async () => {
    const arms = ["corvell-tern-12", "corvell-tern-25"];
    const { page, finish } = await open(`compare/?arms=${arms.join(",")}`);
    await page.waitForFunction(() => !document.querySelector("[data-compare-cells-list]")?.hasAttribute("hidden"));
    expect(await page.locator(`[data-compare-cells-list] li[data-cell="${CELL}"]`).count()).toBe(1);
    const start = page.locator("[data-compare-cells-start]");
    expect(await start.getAttribute("href")).toMatch(new RegExp(`/cells/edit/\\?arms=${arms.join(",")}$`));
    await start.click();
    await editorDone(page, 1);
    const ticked = await page.$$eval(".cell-editor-candidates input:checked", (els) =>
      els.map((e) => (e as HTMLInputElement).value),
    );
    expect(ticked).toEqual(arms);
    expect(await rankingRows(page, "#edit-ranking-table").then((r) => r.map((x) => x.arm).sort())).toEqual(arms);
    expect(await finish()).toEqual([]);
  });
});
