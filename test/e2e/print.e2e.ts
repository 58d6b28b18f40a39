/**
 * Printing an arm sheet: every arm prints to A4 and to Letter through Chromium's page.pdf(), and the document is
 * clean: no navigation or form controls, the cautions kept, every page carrying the page's address and spec
 * fingerprint, no chart split across pages, nothing wider than the paper, no text too small to read.
 *
 * Two views of the same print layout are checked:
 * - the print-media DOM (page.emulateMedia({ media: "print" }) with the viewport set to the printable area of the
 *   paper), where computed styles and boxes can be read;
 * - the PDF itself, whose page texts are read with test/e2e/helpers/pdfText.ts (node:zlib only; no PDF library).
 * The PDFs go to test-results/print/ for a person to look at.
 */
import { mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { readArmFiles, type ArmFile } from "./helpers/armFiles";
import { collectProblems, launchChromium, watchPage } from "./helpers/browser";
import { pdfPageTexts, squeeze } from "./helpers/pdfText";

const root = new URL("../..", import.meta.url).pathname;
const siteUrl = inject("siteUrl");
const origin = inject("origin");
const arms = readArmFiles(root);
const outDir = join(root, "test-results", "print");

/** CSS px per mm: 1in = 96px = 25.4mm (CSS Values and Units 4, §6.2 absolute lengths). */
const PX_PER_MM = 96 / 25.4;

/** Most printed pages of one arm sheet (both paper sizes). */
const MAX_PRINTED_PAGES = 18;

/** Paper sizes as page.pdf() knows them, in mm (ISO 216 A4; ANSI Letter 8.5 × 11 in). */
const PAPER = {
  A4: { widthMm: 210, heightMm: 297 },
  Letter: { widthMm: 215.9, heightMm: 279.4 },
} as const;
type Format = keyof typeof PAPER;
const FORMATS = Object.keys(PAPER) as Format[];

/** The page margins the print stylesheet asks for (`@page { margin: top sides bottom }`), read from the file itself. */
const MARGIN_MM = (() => {
  const css = readFileSync(join(root, "src", "styles", "print.css"), "utf8");
  const m = /@page\s*{[^}]*?margin:\s*([\d.]+)mm\s+([\d.]+)mm\s+([\d.]+)mm/.exec(css);
  if (!m) throw new Error("print.css: no `@page { margin: <top>mm <sides>mm <bottom>mm }` found");
  return { top: Number(m[1]), side: Number(m[2]), bottom: Number(m[3]) };
})();

function printable(format: Format): { widthPx: number; heightPx: number } {
  const p = PAPER[format];
  return {
    widthPx: Math.floor((p.widthMm - 2 * MARGIN_MM.side) * PX_PER_MM),
    heightPx: Math.floor((p.heightMm - MARGIN_MM.top - MARGIN_MM.bottom) * PX_PER_MM),
  };
}

/** Smallest readable sizes on paper (common practice, no source): 6 pt for chart labels, 7.5 pt for other text. */
const MIN_CHART_TEXT_PX = 6 * (96 / 72);
const MIN_TEXT_PX = 7.5 * (96 / 72);

/** Phrases of the cautions that must survive printing (the same block site.e2e.ts checks on screen). */
const CAUTION_PHRASES = [
  "not safety data",
  "not a risk assessment",
  "ISO 10218-1",
  "ISO 12100",
  "ISO/TS 15066",
  "local codes and qualified safety practice",
];

/** Screen-only words that must not reach the paper: the line check form's heading and button. */
const SCREEN_ONLY_TEXTS = [
  "Check a line",
  "Check the line",
  "Open this line in the form",
  "On this page",
  "Skip to content",
];

/**
 * The arms to print: every file in arms/. The catalog holds 6-axis arms, a SCARA, a gantry, a 7-axis arm and a
 * palletizer with a passive joint, so every chart layout the sheet has is printed.
 */
const PRINTED = arms;

let browser: Browser;

beforeAll(async () => {
  mkdirSync(outDir, { recursive: true });
  browser = await launchChromium();
});

afterAll(async () => {
  await browser?.close();
});

interface PrintLayout {
  readonly hidden: { readonly selector: string; readonly visible: number }[];
  readonly scrollWidth: number;
  readonly contentHeight: number;
  readonly figures: {
    readonly id: string;
    readonly breakInside: string;
    readonly height: number;
    readonly svgRight: number;
    readonly title: string;
    readonly caption: string;
  }[];
  readonly headingsBreakAfter: string[];
  readonly theadDisplays: string[];
  readonly rowBreaks: string[];
  readonly smallestChartText: { readonly px: number; readonly text: string };
  readonly smallestText: { readonly px: number; readonly text: string };
  readonly cautions: string;
  readonly cautionsVisible: boolean;
  readonly printRef: string;
  readonly printRefAttr: string;
  readonly background: string;
  readonly ink: string;
}

/** Reads the print layout from the print-media DOM (the viewport already set to the printable area). */
function readLayout(page: Page): Promise<PrintLayout> {
  return page.evaluate(() => {
    const visible = (e: Element): boolean => e.checkVisibility({ visibilityProperty: true, opacityProperty: true });
    const hiddenSelectors = [
      ".site-header",
      ".section-nav",
      ".breadcrumb",
      ".skip-link",
      "#downloads",
      "form",
      "button",
      "input",
      "select",
      "textarea",
      "nav",
    ];
    const hidden = hiddenSelectors.map((selector) => ({
      selector,
      visible: Array.from(document.querySelectorAll(selector)).filter(visible).length,
    }));
    // Figures the print leaves out (inside a screen-only block) are not on paper.
    const figures = Array.from(document.querySelectorAll("main figure"))
      .filter(visible)
      .map((f) => {
        const svg = f.querySelector("svg");
        return {
          id: f.id,
          breakInside: getComputedStyle(f).breakInside,
          height: f.getBoundingClientRect().height,
          svgRight: svg ? svg.getBoundingClientRect().right : 0,
          title: (svg?.querySelector(".chart-title")?.textContent ?? "").trim(),
          caption: (f.querySelector("figcaption")?.textContent ?? "").replace(/\s+/g, " ").trim(),
        };
      });
    const headings = Array.from(document.querySelectorAll("main h2, main h3")).filter(visible);
    const tables = Array.from(document.querySelectorAll<HTMLTableElement>("main table.data-table")).filter(visible);

    // Chart text: the font size in the drawing times the drawing's scale on the page.
    let smallestChartText = { px: Infinity, text: "" };
    for (const svg of Array.from(document.querySelectorAll("main svg.chart")).filter(visible) as SVGSVGElement[]) {
      const scale = svg.getBoundingClientRect().width / svg.viewBox.baseVal.width;
      for (const t of Array.from(svg.querySelectorAll("text"))) {
        if (!(t.textContent ?? "").trim()) continue;
        const px = parseFloat(getComputedStyle(t).fontSize) * scale;
        if (px < smallestChartText.px) smallestChartText = { px, text: `${svg.id}: ${t.textContent ?? ""}` };
      }
    }
    // Other text: every rendered element outside the charts with text of its own.
    let smallestText = { px: Infinity, text: "" };
    for (const e of Array.from(document.querySelectorAll("body *"))) {
      if (e.closest("svg") || !visible(e)) continue;
      const own = Array.from(e.childNodes)
        .filter((n) => n.nodeType === Node.TEXT_NODE)
        .map((n) => n.textContent ?? "")
        .join("")
        .trim();
      if (!own) continue;
      const px = parseFloat(getComputedStyle(e).fontSize);
      if (px < smallestText.px)
        smallestText = { px, text: `${e.tagName.toLowerCase()}.${e.className}: ${own.slice(0, 40)}` };
    }
    const cautions = document.querySelector("#cautions");
    const ref = document.querySelector(".site-footer .print-ref");
    return {
      hidden,
      scrollWidth: document.documentElement.scrollWidth,
      contentHeight: document.documentElement.scrollHeight,
      figures,
      headingsBreakAfter: headings.map((h) => getComputedStyle(h).breakAfter),
      theadDisplays: tables.map((t) => (t.tHead ? getComputedStyle(t.tHead).display : "none")),
      rowBreaks: tables.flatMap((t) =>
        Array.from(t.querySelectorAll("tbody tr")).map((r) => getComputedStyle(r).breakInside),
      ),
      smallestChartText,
      smallestText,
      cautions: (cautions?.textContent ?? "").replace(/\s+/g, " "),
      cautionsVisible: cautions ? visible(cautions) : false,
      printRef: ref && visible(ref) ? (ref.textContent ?? "").replace(/\s+/g, " ").trim() : "",
      printRefAttr: document.documentElement.dataset.printRef ?? "",
      background: getComputedStyle(document.documentElement).backgroundColor,
      ink: getComputedStyle(document.body).color,
    };
  });
}

describe("printed arm sheet", () => {
  it("prints every arm (the catalog has the arm kinds the sheet lays out differently)", () => {
    expect(PRINTED.length).toBeGreaterThanOrEqual(4);
  });

  it.each(PRINTED.map((a) => [a.id, a] as const))(
    "%s prints on A4 and Letter",
    async (id, arm: ArmFile) => {
      const context = await browser.newContext();
      const page = await context.newPage();
      const problems = await watchPage(page, origin);
      const response = await page.goto(`${siteUrl}arms/${id}/`, { waitUntil: "load" });
      expect(response?.status()).toBe(200);
      const pathPart = `arms/${id}/`;

      for (const format of FORMATS) {
        const area = printable(format);
        const label = `${id} ${format}`;

        // 1. The print-media DOM at the printable width and height of this paper.
        await page.setViewportSize({ width: area.widthPx, height: area.heightPx });
        await page.emulateMedia({ media: "print" });
        const layout = await readLayout(page);

        for (const h of layout.hidden) expect(h.visible, `${label}: visible ${h.selector} in print`).toBe(0);
        expect(layout.cautionsVisible, `${label}: cautions printed`).toBe(true);
        for (const phrase of CAUTION_PHRASES) expect(layout.cautions, `${label}: cautions`).toContain(phrase);
        // Nothing wider than the paper: Chromium would otherwise shrink every page to fit the widest element.
        expect(layout.scrollWidth, `${label}: widest element`).toBeLessThanOrEqual(area.widthPx);
        expect(layout.background).toBe("rgb(255, 255, 255)");
        expect(layout.ink).toBe("rgb(0, 0, 0)");

        // No chart split: every figure asks not to be broken and fits on one page, so the browser can honour the ask
        // (CSS Fragmentation 3 §3.3: `avoid` is honoured whenever the box fits in a fresh fragmentainer).
        expect(layout.figures.length, `${label}: figures`).toBeGreaterThanOrEqual(5);
        for (const f of layout.figures) {
          expect(f.breakInside, `${label}: ${f.id} break-inside`).toBe("avoid");
          expect(f.height, `${label}: ${f.id} height (px) against the page`).toBeLessThanOrEqual(area.heightPx);
          expect(f.svgRight, `${label}: ${f.id} right edge (px)`).toBeLessThanOrEqual(area.widthPx);
        }
        for (const b of layout.headingsBreakAfter) expect(b, `${label}: heading break-after`).toBe("avoid");
        expect(layout.theadDisplays.length).toBeGreaterThan(0);
        for (const d of layout.theadDisplays) expect(d, `${label}: table header repeats`).toBe("table-header-group");
        for (const b of layout.rowBreaks) expect(b, `${label}: table row break-inside`).toBe("avoid");
        expect(
          layout.smallestChartText.px,
          `${label}: smallest chart text ${layout.smallestChartText.text}`,
        ).toBeGreaterThanOrEqual(MIN_CHART_TEXT_PX);
        expect(layout.smallestText.px, `${label}: smallest text ${layout.smallestText.text}`).toBeGreaterThanOrEqual(
          MIN_TEXT_PX,
        );
        expect(layout.printRef).toContain(pathPart);
        expect(layout.printRef).toContain(arm.fingerprint);
        expect(layout.printRefAttr).toContain(pathPart);
        expect(layout.printRefAttr).toContain(arm.fingerprint);

        // 2. The PDF.
        const pdf = await page.pdf({ format });
        writeFileSync(join(outDir, `${id}-${format}.pdf`), pdf);
        const objectCount = (pdf.toString("latin1").match(/\/Type\s*\/Page[^s]/g) ?? []).length;
        const { pages } = pdfPageTexts(pdf);
        expect(pages.length, `${label}: pages in the page tree against /Type /Page objects`).toBe(objectCount);

        // Page count: never fewer than the printed content's height in pages (breaks only add blank space), and not
        // more than half as many again (at most a third of the paper left blank by kept-together blocks); 18 at most
        // (16 until the sheet gained the declared datasheet, the tool-direction map and the revision sections).
        const contentPages = layout.contentHeight / area.heightPx;
        expect(pages.length, `${label}: pages for ${contentPages.toFixed(2)} pages of content`).toBeGreaterThanOrEqual(
          Math.max(2, Math.floor(contentPages)),
        );
        expect(pages.length, `${label}: pages for ${contentPages.toFixed(2)} pages of content`).toBeLessThanOrEqual(
          Math.ceil(1.5 * contentPages),
        );
        expect(pages.length, label).toBeLessThanOrEqual(MAX_PRINTED_PAGES);

        // Every page's bottom margin carries the address, the fingerprint and "page i of n".
        const ref = squeeze(layout.printRefAttr);
        pages.forEach((text, i) => {
          const t = squeeze(text);
          expect(t, `${label}: page ${i + 1} footer`).toContain(ref);
          expect(t, `${label}: page ${i + 1} number`).toContain(squeeze(`page ${i + 1} of ${pages.length}`));
        });

        // No chart split, seen in the PDF: a chart's title (top of the drawing) and the whole of its caption (bottom of
        // the figure) are on one and the same page.
        const squeezed = pages.map(squeeze);
        for (const f of layout.figures.filter((x) => x.title)) {
          const title = squeeze(f.title);
          const onPages = squeezed.flatMap((t, i) => (t.includes(title) ? [i + 1] : []));
          expect(onPages.length, `${label}: pages showing "${f.title}": ${onPages.join(", ")}`).toBe(1);
          expect(squeezed[onPages[0]! - 1], `${label}: caption of ${f.id} on page ${onPages[0]!}`).toContain(
            squeeze(f.caption),
          );
        }

        const all = squeezed.join("");
        for (const phrase of CAUTION_PHRASES) expect(all, `${label}: cautions in the PDF`).toContain(squeeze(phrase));
        for (const screenOnly of SCREEN_ONLY_TEXTS)
          expect(all, `${label}: "${screenOnly}" printed`).not.toContain(squeeze(screenOnly));

        process.stdout.write(`[print] ${label}: ${pages.length} pages (content ${contentPages.toFixed(2)} pages)\n`);
      }

      expect(await collectProblems(page, problems)).toEqual([]);
      await context.close();
    },
    180_000,
  );
});
