/**
 * Time to interactive of the side-by-side page: serves a built dist/ under its base path (the browser suite's static
 * server), opens /compare/?arms=… in headless Chromium and measures from navigation start to the moment the page
 * marks itself ready (<html data-ready="true">, set by src/scripts/compare.ts once every chart and table is drawn).
 * A fresh browser context per run (cold HTTP cache). Target: under 1 s for four arms.
 *
 * Run alone: `npx tsx test/bench/compareInteractive.ts [distDir] [base] [runs]` (build first, with the same base).
 */
import { resolve } from "node:path";
import { launchChromium } from "../e2e/helpers/browser";
import { serveStatic } from "../e2e/helpers/staticServer";
import { median } from "./stats";

export interface CompareInteractiveOptions {
  readonly distDir: string;
  /** Base path the site was built for, e.g. "/" or "/tools/armdex/". */
  readonly base: string;
  /** Arm ids for ?arms=. */
  readonly arms: readonly string[];
  readonly runs: number;
}

export async function measureCompareInteractive(opts: {
  distDir: string;
  base: string;
  arms: string[];
  runs: number;
}): Promise<{ medianMs: number; runsMs: number[] }> {
  if (!(opts.runs >= 1)) throw new RangeError(`invalid runs: ${opts.runs}`);
  const server = await serveStatic(opts.distDir, opts.base);
  const browser = await launchChromium();
  const runsMs: number[] = [];
  try {
    const url = `${server.siteUrl}compare/?arms=${opts.arms.map(encodeURIComponent).join(",")}`;
    for (let i = 0; i < opts.runs; i++) {
      const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
      const page = await context.newPage();
      await page.goto(url, { waitUntil: "commit" });
      await page.waitForSelector("html[data-ready='true']", { timeout: 30_000, state: "attached" });
      const state = await page.getAttribute("[data-compare]", "data-state");
      if (state !== "done") throw new Error(`the page did not draw the comparison (state ${String(state)}): ${url}`);
      // performance.now() counts from the navigation's time origin (navigation start).
      runsMs.push(await page.evaluate(() => Number(document.documentElement.dataset.readyMs ?? performance.now())));
      await context.close();
    }
  } finally {
    await browser.close();
    await server.close();
  }
  return { medianMs: median(runsMs), runsMs };
}

const entry = process.argv[1] ? resolve(process.argv[1]) : "";
if (entry === resolve(new URL(import.meta.url).pathname)) {
  const [distDir = "dist", base = process.env.ARMDEX_BASE ?? "/", runs = "7"] = process.argv.slice(2);
  const arms = ["corvell-tern-7", "brandmoor-lyra-c12", "corvell-tern-25", "corvell-heron-210l"];
  const result = await measureCompareInteractive({ distDir, base, arms, runs: Number(runs) });
  console.log(
    `compare page, ${arms.length} arms: interactive in ${result.medianMs.toFixed(0)} ms (median of ${result.runsMs.length}: ${result.runsMs.map((v) => v.toFixed(0)).join(", ")} ms)`,
  );
}
