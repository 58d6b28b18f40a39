/**
 * The computed part of every arm sheet in a real browser: the key figures, the sections with their anchors, each
 * chart an accessible inline SVG with a title and axis labels with units, the analysis warnings, downloads that parse
 * (CSV text cells that would start a formula are escaped), and the page weight (HTML with its inline SVG) within
 * 300 KB. The catalog shows the computed columns. Screenshots of a 6-axis arm and the SCARA go to
 * test-results/screenshots/ for a person to look at.
 */
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { readArmFiles } from "./helpers/armFiles";
import { launchChromium, openWatched, type WatchedPage } from "./helpers/browser";

const root = new URL("../..", import.meta.url).pathname;
const siteUrl = inject("siteUrl");
const origin = inject("origin");
const arms = readArmFiles(root);
const shotsDir = join(root, "test-results", "screenshots");

/** Largest arm sheet: HTML bytes including the inline SVG charts (stylesheets are shared and counted apart). */
const PAGE_WEIGHT_LIMIT_BYTES = 300_000;
const SECTION_ANCHORS = [
  "#summary",
  "#envelope",
  "#speed",
  "#directions",
  "#singularities",
  "#payload",
  "#cycle",
  "#joints",
  "#downloads",
  "#source",
];

interface AnalysisJson {
  id: string;
  specHash: string;
  reach: { wcpMaxMm: number | null; flangeMaxMm: number; statedMm: number | null };
  speed: { maps: { orientation: string }[] };
  capability: { areaShareAtLeastHalf: number | null } | null;
  payload: { atReach: unknown[] };
  warnings: { code: string; message: string }[];
}

let browser: Browser;
const weights: { id: string; htmlBytes: number; svgBytes: number; charts: number }[] = [];

beforeAll(async () => {
  mkdirSync(shotsDir, { recursive: true });
  browser = await launchChromium();
});

afterAll(async () => {
  if (weights.length > 0) {
    const lines = weights.map(
      (w) =>
        `${w.id.padEnd(24)} ${(w.htmlBytes / 1000).toFixed(1).padStart(6)} kB HTML, of which ${(w.svgBytes / 1000).toFixed(1).padStart(6)} kB in ${w.charts} inline SVG charts`,
    );
    writeFileSync(join(shotsDir, "page-weights.txt"), `${lines.join("\n")}\n`);
    process.stdout.write(`[e2e] arm sheet weights:\n${lines.join("\n")}\n`);
  }
  await browser?.close();
});

async function openPage(path: string): Promise<WatchedPage> {
  const opened = await openWatched(
    () => browser.newPage({ viewport: { width: 1280, height: 900 } }),
    `${siteUrl}${path}`,
    origin,
  );
  expect(opened.status, `HTTP status of /${path}`).toBe(200);
  return opened;
}

/** RFC 4180 reader, enough for our files: quoted fields with doubled quotes, CRLF records. */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let field = "";
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i]!;
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') {
        field += '"';
        i++;
      } else if (c === '"') quoted = false;
      else field += c;
    } else if (c === '"') quoted = true;
    else if (c === ",") {
      row.push(field);
      field = "";
    } else if (c === "\r" && text[i + 1] === "\n") {
      row.push(field);
      rows.push(row);
      row = [];
      field = "";
      i++;
    } else field += c;
  }
  if (field !== "" || row.length > 0) rows.push([...row, field]);
  return rows;
}

/** A field a spreadsheet would run as a formula: starts with = + - @ and is not a plain number. */
function formulaLike(field: string): boolean {
  return /^[=+\-@\t\r]/.test(field) && !/^-?\d+(\.\d+)?(e-?\d+)?$/i.test(field);
}

describe("arm sheet, computed sections", () => {
  it.each(arms.map((a) => [a.id] as const))(
    "%s: sections, charts, figures, warnings, downloads and weight",
    async (id) => {
      const { page, finish } = await openPage(`arms/${id}/`);

      // Sections with their anchors, each listed in the contents.
      const anchors = await page.$$eval("main section[id]", (s) => s.map((e) => `#${e.id}`));
      for (const a of SECTION_ANCHORS) expect(anchors, `section ${a} on ${id}`).toContain(a);
      const listed = await page.$$eval(".section-nav a", (links) => links.map((l) => l.getAttribute("href")));
      expect(listed).toEqual(anchors);

      // Every chart: inline SVG, role img, aria-label, <title> and <desc>, axis labels with a unit in parentheses.
      const charts = await page.$$eval("main svg.chart", (svgs) =>
        svgs.map((s) => ({
          id: s.id,
          section: s.closest("section")?.id ?? "",
          role: s.getAttribute("role"),
          label: s.getAttribute("aria-label") ?? "",
          title: s.querySelector(":scope > title")?.textContent ?? "",
          desc: s.querySelector(":scope > desc")?.textContent ?? "",
          axisLabels: Array.from(s.querySelectorAll(".axis-label")).map((t) => t.textContent ?? ""),
          caption: s.closest("figure")?.querySelector("figcaption")?.textContent ?? "",
          styled: s.querySelectorAll("[style]").length,
          width: s.getBoundingClientRect().width,
        })),
      );
      const analysis = (await (await fetch(`${siteUrl}data/arms/${id}.json`)).json()) as AnalysisJson;
      const orientations = analysis.speed.maps.length;
      const bySection = (s: string) => charts.filter((c) => c.section === s);
      expect(bySection("envelope")).toHaveLength(2);
      expect(bySection("speed")).toHaveLength(orientations);
      expect(bySection("singularities")).toHaveLength(orientations);
      // Tool directions: the map, or a sentence where the arm has none.
      expect(bySection("directions")).toHaveLength(analysis.capability ? 1 : 0);
      expect(await page.locator("#directions .capability-absent").count()).toBe(analysis.capability ? 0 : 1);
      expect(bySection("payload").length).toBeGreaterThanOrEqual(1);
      for (const c of charts) {
        expect(c.role, `${id} ${c.id}`).toBe("img");
        expect(c.label.length, `${id} ${c.id} aria-label`).toBeGreaterThan(5);
        expect(c.title, `${id} ${c.id} title`).toBe(c.label);
        expect(c.desc.length, `${id} ${c.id} desc`).toBeGreaterThan(20);
        expect(c.axisLabels.length, `${id} ${c.id} axis labels`).toBeGreaterThanOrEqual(1);
        for (const l of c.axisLabels)
          expect(l, `${id} ${c.id} axis label`).toMatch(/\((mm|m\/s|kg|s|deg|% of max\.|× limit)\)$/);
        expect(c.caption.length, `${id} ${c.id} caption`).toBeGreaterThan(60);
        expect(c.styled, `${id} ${c.id} style attributes`).toBe(0);
        expect(c.width, `${id} ${c.id} rendered width`).toBeGreaterThan(300);
      }
      expect(await page.locator("#speed .chart .step-scale .legend-title").first().textContent()).toBe(
        "guaranteed straight-line speed (m/s)",
      );
      const ids = await page.$$eval("[id]", (els) => els.map((e) => e.id));
      expect(
        ids.filter((x, i) => ids.indexOf(x) !== i),
        `${id}: duplicate element ids`,
      ).toEqual([]);

      // Key figures: computed reach with the stated reach and the 2 % flag, checked against the JSON independently.
      const computed = analysis.reach.wcpMaxMm ?? analysis.reach.flangeMaxMm;
      const reachFigure = page.locator('.key-figure[data-key="reach"]');
      expect(await reachFigure.locator(".key-value").textContent()).toBe(
        `${Math.round(computed).toLocaleString("en")}\u00a0mm`,
      );
      const mismatch = analysis.reach.statedMm !== null && Math.abs(analysis.reach.statedMm / computed - 1) > 0.02;
      expect(await reachFigure.locator(".key-flag").count(), `${id} reach flag`).toBe(mismatch ? 1 : 0);
      for (const key of ["max-tool-speed", "share-1", "cycle", "capability-half"])
        expect(await page.locator(`.key-figure[data-key="${key}"]`).count()).toBe(1);

      // The analysis warnings, all of them.
      expect(await page.locator("#summary .analysis-warnings li").count(), `${id} warnings`).toBe(
        analysis.warnings.length,
      );

      // Downloads: the JSON is this arm's; the URDF is XML up to the flange; the CSVs parse, and no text cell could run
      // as a formula.
      expect(analysis.id).toBe(id);
      const hrefs = await page.$$eval("#downloads a", (links) => links.map((l) => (l as HTMLAnchorElement).href));
      expect(hrefs).toHaveLength(4);
      for (const href of hrefs) {
        const res = await fetch(href);
        expect(res.status, href).toBe(200);
        if (href.endsWith(".urdf")) {
          const urdf = await res.text();
          expect(urdf, href).toMatch(/^<\?xml version="1\.0"\?>/);
          expect(urdf, href).toContain('<link name="flange"/>');
        }
        if (!href.endsWith(".csv")) continue;
        const rows = parseCsv(await res.text());
        const width = rows[0]!.length;
        expect(
          rows.every((r) => r.length === width),
          `${href}: every row as wide as the header`,
        ).toBe(true);
        for (const r of rows)
          for (const f of r) expect(formulaLike(f), `${href}: field ${JSON.stringify(f)}`).toBe(false);
        if (href.endsWith("payload.csv")) expect(rows.length - 1).toBe(analysis.payload.atReach.length);
      }

      // Page weight: the HTML as delivered, inline SVG included.
      const weight = await page.evaluate(() => {
        const nav = performance.getEntriesByType("navigation")[0] as PerformanceNavigationTiming;
        const svgBytes = Array.from(document.querySelectorAll("svg.chart")).reduce(
          (n, s) => n + new TextEncoder().encode(s.outerHTML).length,
          0,
        );
        return { htmlBytes: nav.decodedBodySize, svgBytes, charts: document.querySelectorAll("svg.chart").length };
      });
      weights.push({ id, ...weight });
      expect(weight.htmlBytes, `${id}: HTML + inline SVG bytes`).toBeLessThanOrEqual(PAGE_WEIGHT_LIMIT_BYTES);

      expect(await finish()).toEqual([]);
    },
  );

  it("screenshots a 6-axis arm sheet and the SCARA's, whole and chart by chart", async () => {
    const six =
      arms.find((a) => a.joints.length === 6 && a.id.includes("tern-7")) ?? arms.find((a) => a.joints.length === 6)!;
    const scara = arms.find((a) => a.id.includes("sable")) ?? arms.find((a) => a.joints.length === 4)!;
    for (const arm of [six, scara]) {
      const { page, finish } = await openPage(`arms/${arm.id}/`);
      await page.screenshot({ path: join(shotsDir, `sheet-${arm.id}.png`), fullPage: true });
      for (const s of ["summary", "envelope", "speed", "directions", "singularities", "payload", "cycle"]) {
        await page.locator(`#${s}`).screenshot({ path: join(shotsDir, `sheet-${arm.id}-${s}.png`) });
      }
      expect(await finish()).toEqual([]);
    }
  });
});

describe("catalog, computed columns", () => {
  it("shows computed reach, tool speed, line-speed share and cycle for every arm", async () => {
    const { page, finish } = await openPage("");
    const headers = (await page.locator("#catalog thead th").allTextContents()).map((t) =>
      t.replace(/\s+/g, " ").trim(),
    );
    for (const h of [
      "Computed reach (mm)",
      "Stated reach (mm)",
      "Max tool speed (m/s)",
      "Share \u2265 1 m/s, tool down (%)",
      "Standard cycle (s)",
    ]) {
      expect(headers).toContain(h);
    }
    for (const arm of arms) {
      const row = page.locator(`#catalog tbody tr[data-key="${arm.id}"]`);
      const analysis = (await (await fetch(`${siteUrl}data/arms/${arm.id}.json`)).json()) as AnalysisJson;
      const computed = analysis.reach.wcpMaxMm ?? analysis.reach.flangeMaxMm;
      expect(Number(await row.locator('[data-key="computed-reach"]').getAttribute("data-sort"))).toBeCloseTo(
        computed,
        6,
      );
      expect((await row.locator('[data-key="max-tool-speed"]').textContent())?.trim()).toMatch(/^\d+(\.\d+)?$/);
    }
    expect(await finish()).toEqual([]);
  });
});
