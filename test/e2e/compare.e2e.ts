/**
 * The side-by-side page in a real browser, served under the base path like every browser test:
 * - three arms overlay: three envelope outlines, each with its own dash pattern, and a legend of three;
 * - the best marks of the spec and speed tables match the best values computed here from the arm files and the
 *   published full analyses (dist/data/arms/<id>.json);
 * - the requirements panel's pass/fail matches a case worked out here from the full analyses, independently of
 *   src/view/requirements.ts: payload rows read directly, the band tested against the flange envelope by brute-force
 *   sampling every 5 mm with an even–odd point test written here, the speed map read node by node;
 * - the requirements round-trip through the address; bad arm lists get a message naming the valid ids;
 * - no console error, no CSP violation, no failed request, no request to another host.
 * Screenshots go to test-results/screenshots for a person to look at.
 */
import { mkdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { readArmFiles } from "./helpers/armFiles";
import { launchChromium, openWatched, type WatchedPage } from "./helpers/browser";

const root = new URL("../..", import.meta.url).pathname;
const siteUrl = inject("siteUrl");
const origin = inject("origin");
const distDir = inject("distDir");
const shotsDir = join(root, "test-results", "screenshots");
const armFiles = readArmFiles(root);

const THREE = ["corvell-tern-7", "brandmoor-lyra-c12", "corvell-tern-25"] as const;

interface FullAnalysis {
  readonly envelope: {
    readonly flange: {
      readonly side: readonly { readonly outer: [number, number][]; readonly holes: [number, number][][] }[];
    };
  };
  readonly payload: {
    readonly atReach: readonly {
      mounting: string;
      reachMm: number;
      offsetMm: number;
      payloadKg: number;
      limitedBy: string;
    }[];
  };
  readonly speed: {
    readonly maxToolSpeedMmPerS: number;
    readonly maps: readonly {
      orientation: string;
      grid: { nx: number; ny: number; rMinMm: number; zMinMm: number; stepMm: number };
      maxGuaranteedMmPerS: number;
      shareAtLeast: Record<string, number>;
      guaranteedMmPerS: (number | null)[];
    }[];
  };
  readonly cycle: { readonly standardCycleS: number | null };
  readonly capability: { readonly areaShareAtLeastHalf: number | null } | null;
}

const analysis = (id: string) =>
  JSON.parse(readFileSync(join(distDir, "data", "arms", `${id}.json`), "utf8")) as FullAnalysis;
const armFile = (id: string) => {
  const f = armFiles.find((a) => a.id === id);
  if (!f) throw new Error(`no arm file ${id}`);
  return f as unknown as {
    id: string;
    ratedPayloadKg: number;
    repeatabilityMm: number;
    massKg?: number;
    mountings: string[];
  };
};

let browser: Browser;

beforeAll(async () => {
  mkdirSync(shotsDir, { recursive: true });
  browser = await launchChromium();
});

afterAll(async () => {
  await browser?.close();
});

async function open(path: string, width = 1280): Promise<WatchedPage> {
  const opened = await openWatched(
    () => browser.newPage({ viewport: { width, height: 900 } }),
    `${siteUrl}${path}`,
    origin,
  );
  expect(opened.status).toBe(200);
  await opened.page.waitForSelector("html[data-ready='true']", { timeout: 30_000 });
  return opened;
}

/** Ids of the arms holding the best value (ties all), none when fewer than two values or all equal. */
function bestIds(values: readonly { id: string; v: number | null }[], better: "higher" | "lower"): string[] {
  const present = values.filter((x): x is { id: string; v: number } => x.v !== null);
  if (present.length < 2) return [];
  const best = better === "higher" ? Math.max(...present.map((x) => x.v)) : Math.min(...present.map((x) => x.v));
  if (present.every((x) => x.v === best)) return [];
  return present
    .filter((x) => x.v === best)
    .map((x) => x.id)
    .sort();
}

async function markedIds(page: Page, row: string): Promise<string[]> {
  return (
    await page.$$eval(`tr[data-row="${row}"] td[data-best="true"]`, (tds) =>
      tds.map((td) => td.getAttribute("data-arm") ?? ""),
    )
  ).sort();
}

describe("side-by-side page", () => {
  it("overlays three arms with distinct dash patterns and a legend of three", async () => {
    const { page, finish } = await open(`compare/?arms=${THREE.join(",")}`);
    const paths = await page.$$eval("#compare-envelope-chart path.env-overlay", (ps) =>
      ps.map((p) => ({
        arm: p.getAttribute("data-arm"),
        dash: getComputedStyle(p).strokeDasharray,
        stroke: getComputedStyle(p).stroke,
      })),
    );
    expect(paths.map((p) => p.arm)).toEqual([...THREE]);
    expect(new Set(paths.map((p) => p.dash)).size).toBe(3);
    expect(new Set(paths.map((p) => p.stroke)).size).toBe(3);
    const legend = await page.$$eval("#compare-envelope-chart .legend-item[data-key]", (gs) =>
      gs.map((g) => g.getAttribute("data-key")),
    );
    expect(legend).toEqual([...THREE]);
    // The payload chart: one curve per arm too, same line styles.
    expect(await page.$$eval("#compare-payload-chart path[data-arm]", (ps) => ps.length)).toBe(3);
    // Accessible name and description on both charts.
    // The accessible name is the chart's title (src/charts/compareCharts.ts), not just any non-empty text.
    const names: Record<string, RegExp> = {
      "compare-envelope-chart": /^Reach envelopes, side view: \S/,
      "compare-payload-chart": /^Payload at reach, CG offset [\d,]+ mm$/,
    };
    for (const [id, name] of Object.entries(names)) {
      expect(await page.getAttribute(`#${id}`, "aria-label")).toMatch(name);
      expect((await page.textContent(`#${id}-desc`))?.length ?? 0).toBeGreaterThan(40);
    }
    await page.screenshot({ path: join(shotsDir, "compare-three.png"), fullPage: true });
    expect(await finish()).toEqual([]);
  });

  it("marks the best value of each ranked row as computed from the arm files and analyses", async () => {
    const ids = ["corvell-tern-7", "brandmoor-lyra-c12", "corvell-tern-25", "brandmoor-lyra-r7"];
    const { page, finish } = await open(`compare/?arms=${ids.join(",")}`);
    const files = ids.map(armFile);
    const full = ids.map(analysis);
    expect(await markedIds(page, "payload")).toEqual(
      bestIds(
        files.map((f) => ({ id: f.id, v: f.ratedPayloadKg })),
        "higher",
      ),
    );
    expect(await markedIds(page, "repeatability")).toEqual(
      bestIds(
        files.map((f) => ({ id: f.id, v: f.repeatabilityMm })),
        "lower",
      ),
    );
    expect(await markedIds(page, "mass")).toEqual(
      bestIds(
        files.map((f) => ({ id: f.id, v: f.massKg ?? null })),
        "lower",
      ),
    );
    expect(await markedIds(page, "max-tool-speed")).toEqual(
      bestIds(
        full.map((a, i) => ({ id: ids[i]!, v: a.speed.maxToolSpeedMmPerS })),
        "higher",
      ),
    );
    expect(await markedIds(page, "cycle")).toEqual(
      bestIds(
        full.map((a, i) => ({ id: ids[i]!, v: a.cycle.standardCycleS })),
        "lower",
      ),
    );
    const down = full.map((a, i) => ({
      id: ids[i]!,
      v: a.speed.maps.find((m) => m.orientation === "down")?.shareAtLeast["1"] ?? null,
    }));
    expect(await markedIds(page, "share-1-down")).toEqual(bestIds(down, "higher"));
    // Tool directions: the share of the side view reached from at least half of the directions ("no map" unranked).
    const directions = full.map((a, i) => ({ id: ids[i]!, v: a.capability?.areaShareAtLeastHalf ?? null }));
    expect(await markedIds(page, "directions-half")).toEqual(bestIds(directions, "higher"));
    const noMap = ids.filter((_, i) => full[i]!.capability === null);
    for (const id of noMap)
      expect(await page.textContent(`tr[data-row="directions-half"] td[data-arm="${id}"]`)).toContain("no map");
    // Unranked rows carry no mark; ranked rows say what best means.
    expect(await markedIds(page, "reach")).toEqual([]);
    expect(await page.textContent('tr[data-row="repeatability"] th')).toContain("lowest");
    // At least one mark is shown, with its words (not colour alone).
    expect(await page.$$eval("td[data-best='true'] .best-mark", (els) => els.map((e) => e.textContent))).toContain(
      "★ best",
    );
    await page.screenshot({ path: join(shotsDir, "compare-four.png"), fullPage: true });
    expect(await finish()).toEqual([]);
  });

  it("passes and fails requirements as worked out from the analyses, and keeps them in the address", async () => {
    const need = { kg: 10, reach: [300, 700] as const, height: [200, 600] as const, speedMPerS: 0.3 };
    const expected = new Map<string, { payload: string; reach: string; speed: string; minKg: number }>();
    for (const id of THREE) {
      const a = analysis(id);
      // Payload, floor mounting, CG offset 0: the band's ends are on rows (every 50 mm), so its rows are those inside.
      const rows = a.payload.atReach.filter(
        (r) => r.mounting === "floor" && r.offsetMm === 0 && r.reachMm >= need.reach[0] && r.reachMm <= need.reach[1],
      );
      expect(rows.length).toBe(9);
      const minKg = Math.min(...rows.map((r) => (r.limitedBy === "unreachable" ? 0 : r.payloadKg)));
      // Reach: every point of the band every 5 mm inside the flange side view (even–odd crossing test, written here).
      const rings = a.envelope.flange.side.flatMap((p) => [p.outer, ...p.holes]);
      const inside = (x: number, y: number) => {
        let c = false;
        for (const ring of rings) {
          for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
            const [xi, yi] = ring[i]!,
              [xj, yj] = ring[j]!;
            if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) c = !c;
          }
        }
        return c;
      };
      let covered = true;
      for (let x = need.reach[0]; x <= need.reach[1] && covered; x += 5)
        for (let y = need.height[0]; y <= need.height[1]; y += 5) if (!inside(x, y)) covered = false;
      // Speed, tool down: every map node in the band reached, lowest guaranteed speed ≥ the minimum. The page reads
      // block minima (50 mm blocks from the map's origin), so it may only be stricter: compute both here.
      const map = a.speed.maps.find((m) => m.orientation === "down")!;
      const g = map.grid;
      let nodeMin = Infinity,
        reached = true;
      const per = Math.ceil(50 / g.stepMm);
      const blocks = new Set<string>();
      for (let iy = 0; iy < g.ny; iy++) {
        for (let ix = 0; ix < g.nx; ix++) {
          const r = g.rMinMm + ix * g.stepMm,
            z = g.zMinMm + iy * g.stepMm;
          if (r < need.reach[0] || r > need.reach[1] || z < need.height[0] || z > need.height[1]) continue;
          const v = map.guaranteedMmPerS[ix + iy * g.nx];
          if (v === null || v === undefined) reached = false;
          else nodeMin = Math.min(nodeMin, v);
          blocks.add(`${Math.floor(ix / per)},${Math.floor(iy / per)}`);
        }
      }
      let blockMin = Infinity;
      for (let iy = 0; iy < g.ny; iy++)
        for (let ix = 0; ix < g.nx; ix++) {
          const v = map.guaranteedMmPerS[ix + iy * g.nx];
          if (v !== null && v !== undefined && blocks.has(`${Math.floor(ix / per)},${Math.floor(iy / per)}`))
            blockMin = Math.min(blockMin, v);
        }
      const speedOk = reached && blockMin >= need.speedMPerS * 1000;
      // The page must never pass what the node-exact reading fails.
      if (!(reached && nodeMin >= need.speedMPerS * 1000)) expect(speedOk).toBe(false);
      expected.set(id, {
        payload: minKg >= need.kg ? "pass" : "fail",
        reach: covered ? "pass" : "fail",
        speed: speedOk ? "pass" : "fail",
        minKg,
      });
    }
    // The case must show both outcomes somewhere, or it proves little.
    const statuses = [...expected.values()].flatMap((e) => [e.payload, e.reach, e.speed]);
    expect(statuses).toContain("pass");
    expect(statuses).toContain("fail");

    const { page, finish } = await open(`compare/?arms=${THREE.join(",")}`);
    await page.fill("input[name='payload']", String(need.kg));
    await page.fill("input[name='reach-min']", String(need.reach[0]));
    await page.fill("input[name='reach-max']", String(need.reach[1]));
    await page.fill("input[name='height-min']", String(need.height[0]));
    await page.fill("input[name='height-max']", String(need.height[1]));
    await page.fill("input[name='speed']", String(need.speedMPerS));
    await page.selectOption("select[name='mounting']", "floor");
    await page.click("form[data-compare-form] button[type='submit']");
    await page.waitForSelector(".verdict-table");
    const shown = async (p: Page) =>
      p.$$eval(".verdict-table td[data-status]", (tds) =>
        tds.map(
          (td) =>
            `${td.closest("tr")?.getAttribute("data-requirement")}:${td.getAttribute("data-arm")}:${td.getAttribute("data-status")}`,
        ),
      );
    const cells = await shown(page);
    for (const id of THREE) {
      const e = expected.get(id)!;
      expect(cells, id).toContain(`mounting:${id}:pass`);
      expect(cells, id).toContain(`payload:${id}:${e.payload}`);
      expect(cells, id).toContain(`reach:${id}:${e.reach}`);
      expect(cells, id).toContain(`speed:${id}:${e.speed}`);
      if (e.payload === "fail") {
        const reason =
          (await page.textContent(`tr[data-requirement="payload"] td[data-arm="${id}"] .verdict-reason`)) ?? "";
        expect(reason.replace(/\u00a0/g, " ")).toContain(`holds ${Math.floor(e.minKg * 100) / 100} kg`);
        expect(reason.replace(/\u00a0/g, " ")).toContain("needs 10 kg");
      }
    }
    // The address holds the requirements; opening it restores the form and the same verdicts.
    const url = page.url();
    const q = new URL(url).searchParams;
    expect(q.get("need-kg")).toBe("10");
    expect(q.get("need-reach")).toBe("300,700");
    expect(q.get("need-height")).toBe("200,600");
    expect(q.get("need-speed")).toBe("0.3");
    expect(q.get("need-mounting")).toBe("floor");
    await page.screenshot({ path: join(shotsDir, "compare-requirements.png"), fullPage: true });
    expect(await finish()).toEqual([]);

    const again = await open(url.slice(siteUrl.length));
    expect(await again.page.inputValue("input[name='payload']")).toBe("10");
    expect(await again.page.inputValue("input[name='height-max']")).toBe("600");
    expect(await again.page.inputValue("select[name='mounting']")).toBe("floor");
    expect(await shown(again.page)).toEqual(cells);
    // The band is drawn on the envelope chart.
    expect(await again.page.$$eval("#compare-envelope-chart rect.need-band:not(.legend-swatch)", (r) => r.length)).toBe(
      1,
    );
    expect(await again.finish()).toEqual([]);
  });

  it("explains unknown ids and too few or too many arms, listing the valid ids", async () => {
    const all = armFiles.map((a) => a.id);
    for (const [arms, words] of [
      ["corvell-tern-7,no-such-arm", 'No arm has the id "no-such-arm"'],
      ["corvell-tern-7", "at least 2"],
      [all.slice(0, 7).join(","), "at most 6"],
    ] as const) {
      const { page, finish } = await open(`compare/?arms=${arms}`);
      const text = (await page.textContent("[data-compare-status]")) ?? "";
      expect(text).toContain(words);
      for (const id of all) expect(text).toContain(id);
      expect(await page.getAttribute("[data-compare-status]", "data-kind")).toBe("error");
      expect(await page.$$eval("#compare-envelope-chart", (e) => e.length)).toBe(0);
      expect(await finish()).toEqual([]);
    }
  });

  it("reads on a narrow screen", async () => {
    const { page, finish } = await open(
      `compare/?arms=${THREE.join(",")}&need-kg=10&need-reach=300,700&need-height=200,600`,
      390,
    );
    const width = await page.evaluate(() => document.documentElement.scrollWidth);
    expect(width).toBeLessThanOrEqual(392);
    await page.screenshot({ path: join(shotsDir, "compare-narrow.png"), fullPage: true });
    expect(await finish()).toEqual([]);
  });
});
