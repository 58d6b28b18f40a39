/**
 * What a user sees in a real browser: the catalog lists every arm file, links lead to the arm sheets, each sheet shows
 * the model, the joints, the fingerprint, the source and the cautions; the methods page explains the conventions.
 * Every page loads with no console error, no CSP violation, no failed request and no request to another host.
 * Screenshots and a PDF go to test-results/ for a person to look at.
 */
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import type { Browser, BrowserContext, BrowserContextOptions, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { isPassive, readArmFiles } from "./helpers/armFiles";
import { collectProblems, launchChromium, watchPage } from "./helpers/browser";

const root = new URL("../..", import.meta.url).pathname;
const siteUrl = inject("siteUrl");
const origin = inject("origin");
const basePath = inject("basePath");
const arms = readArmFiles(root);
const shotsDir = join(root, "test-results", "screenshots");

const CAUTION_PHRASES = [
  "computed from the parameters shown",
  "idealised rigid-body kinematics",
  "early comparison",
  "not maker specifications",
  "not guarantees",
  "not safety data",
  "not a risk assessment",
  "ISO 10218-1",
  "ISO 10218-2",
  "ISO 12100",
  "ISO/TS 15066",
  "local codes and qualified safety practice decide",
];

const DESKTOP: BrowserContextOptions = { viewport: { width: 1280, height: 900 } };

let browser: Browser;
/** One context for the ordinary desktop visits (a new context costs about a second); a fresh page per visit. */
let desktop: BrowserContext;

beforeAll(async () => {
  mkdirSync(shotsDir, { recursive: true });
  browser = await launchChromium();
  desktop = await browser.newContext(DESKTOP);
});

afterAll(async () => {
  await desktop?.close();
  await browser?.close();
});

interface Opened {
  readonly page: Page;
  /** Closes the page (and its own context, if any) and returns every problem seen (empty when all is well). */
  finish(): Promise<string[]>;
}

/**
 * Opens a site path ("" is the home page) in a fresh page, recording problems from the first request on. Options
 * other than the default desktop ones get a context of their own.
 */
async function open(path: string, options?: BrowserContextOptions): Promise<Opened> {
  const context = options ? await browser.newContext({ ...DESKTOP, ...options }) : desktop;
  const page = await context.newPage();
  const problems = await watchPage(page, origin);
  const response = await page.goto(`${siteUrl}${path}`, { waitUntil: "load" });
  expect(response?.status(), `HTTP status of ${siteUrl}${path}`).toBe(200);
  const scripted = options?.javaScriptEnabled !== false;
  return {
    page,
    async finish() {
      // Without JavaScript the page cannot report CSP violations to us; the other records still hold.
      const list = scripted
        ? await collectProblems(page, problems)
        : [...problems.consoleErrors, ...problems.failedRequests, ...problems.foreignRequests];
      await page.close();
      if (options) await context.close();
      return list;
    },
  };
}

async function text(page: Page, selector: string): Promise<string> {
  return ((await page.locator(selector).first().textContent()) ?? "").replace(/\s+/g, " ").trim();
}

describe("catalog", () => {
  it("lists one row per arm file, complete as plain HTML without JavaScript", async () => {
    expect(arms.length, "arm files to build the catalog from").toBeGreaterThan(0);
    const { page, finish } = await open("", { javaScriptEnabled: false });
    await expect.poll(() => page.locator("#catalog tbody tr").count()).toBe(arms.length);
    const headers = await page.locator("#catalog thead th").allTextContents();
    for (const h of [
      "Maker",
      "Model",
      "Class",
      "Driven axes",
      "Rated payload (kg)",
      "Stated reach (mm)",
      "Repeatability (mm)",
      "Mass (kg)",
      "Mountings",
      "Protection",
    ]) {
      expect(headers.map((t) => t.trim())).toContain(h);
    }
    for (const arm of arms) {
      const row = page.locator(`#catalog tbody tr[data-key="${arm.id}"]`);
      expect(await row.count(), `row of ${arm.id}`).toBe(1);
      expect((await row.locator('[data-key="model"] a').textContent())?.trim()).toBe(arm.model);
      expect((await row.locator('[data-key="maker"]').textContent())?.trim()).toBe(arm.maker);
    }
    await page.screenshot({ path: join(shotsDir, "catalog.png"), fullPage: true });
    expect(await finish()).toEqual([]);
  });

  it("leads from the model name to the arm sheet", async () => {
    const arm = arms[0]!;
    const { page, finish } = await open("");
    await page
      .locator(`#catalog tbody tr[data-key="${arm.id}"]`)
      .getByRole("link", { name: arm.model, exact: true })
      .click();
    await page.waitForURL(`${siteUrl}arms/${arm.id}/`);
    expect(await text(page, "h1")).toContain(arm.model);
    expect(await finish()).toEqual([]);
  });

  it("fits a narrow screen: the table scrolls inside its own box", async () => {
    const { page, finish } = await open("", { viewport: { width: 390, height: 844 } });
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(1);
    await page.screenshot({ path: join(shotsDir, "catalog-narrow.png"), fullPage: true });
    expect(await finish()).toEqual([]);
  });
});

describe("arm sheet", () => {
  it.each(arms.map((a) => [a.id, a] as const))(
    "%s shows the model, joints, fingerprint, source and cautions",
    async (id, arm) => {
      const { page, finish } = await open(`arms/${id}/`);
      expect(await text(page, "h1 .arm-model")).toBe(arm.model);
      expect(await page.title()).toContain(arm.model);

      const rows = page.locator("#joints #joint-table tbody tr");
      expect(await rows.count()).toBe(arm.joints.length);
      for (const joint of arm.joints) {
        const row = await text(page, `#joint-table tbody tr[data-key="${joint.name}"]`);
        if (isPassive(joint)) expect(row).toContain(`follows ${joint.coupling!.terms.map((t) => t.joint).join(", ")}`);
        else expect(row).toContain("driven");
      }

      expect(await text(page, "#source .fingerprint")).toBe(arm.fingerprint);
      expect(await text(page, "#source .source-document")).toBe(arm.source.document);
      const source = await text(page, "#source");
      expect(source).toContain(arm.source.revision);
      expect(source).toContain(arm.source.date);

      const cautions = await text(page, "#cautions");
      for (const phrase of CAUTION_PHRASES) expect(cautions, `cautions on ${id}`).toContain(phrase);

      // Only sections with real content: each has something besides its heading, and the contents list matches them.
      const empty = await page.$$eval("main section", (sections) =>
        sections.filter((s) => Array.from(s.children).every((c) => /^H[1-6]$/.test(c.tagName))).map((s) => s.id),
      );
      expect(empty).toEqual([]);
      const listed = await page.$$eval(".section-nav a", (links) => links.map((a) => a.getAttribute("href")));
      const sections = await page.$$eval("main section[id]", (s) => s.map((e) => `#${e.id}`));
      expect(listed).toEqual(sections);
      expect(sections).toEqual(expect.arrayContaining(["#joints", "#source", "#cautions"]));

      if (id === arms[0]!.id || arm.joints.some(isPassive)) {
        await page.screenshot({ path: join(shotsDir, `arm-${id}.png`), fullPage: true });
      }
      expect(await finish()).toEqual([]);
    },
  );

  it("prints without navigation, with its address and fingerprint", async () => {
    const arm = arms.find((a) => a.joints.some(isPassive)) ?? arms[0]!;
    const { page, finish } = await open(`arms/${arm.id}/`);
    await page.emulateMedia({ media: "print" });
    expect(await page.locator(".site-header").isVisible()).toBe(false);
    expect(await page.locator(".section-nav").isVisible()).toBe(false);
    const footer = await text(page, ".site-footer .print-ref");
    expect(footer).toContain(`arms/${arm.id}/`);
    expect(footer).toContain(arm.fingerprint);
    await page.screenshot({ path: join(shotsDir, `arm-${arm.id}-print.png`), fullPage: true });
    const pdf = await page.pdf({ format: "A4", printBackground: false });
    writeFileSync(join(shotsDir, `arm-${arm.id}.pdf`), pdf);
    expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    const pages = (pdf.toString("latin1").match(/\/Type\s*\/Page[^s]/g) ?? []).length;
    expect(pages).toBeGreaterThanOrEqual(1);
    // The sheet carries its charts (each kept whole on a page, at most two to a page) and tables: about 10 A4 pages.
    expect(pages).toBeLessThanOrEqual(16);
    expect(await finish()).toEqual([]);
  });
});

describe("methods page", () => {
  it("explains the conventions, the Jacobian and its measures, with the cautions", async () => {
    const { page, finish } = await open("methods/");
    const headings = (await page.locator("main h2, main h3").allTextContents()).map((t) => t.trim());
    for (const h of [
      "Units",
      "Standard Denavit–Hartenberg",
      "Modified Denavit–Hartenberg",
      "Joint frames",
      "Driven and passive joints",
      "The Jacobian",
      "Singular values",
      "Yoshikawa manipulability",
      "Condition number",
      "Cautions",
    ]) {
      expect(headings).toContain(h);
    }
    expect(await page.locator(".equation").count()).toBeGreaterThanOrEqual(8);
    const cautions = await text(page, ".cautions");
    for (const phrase of CAUTION_PHRASES) expect(cautions).toContain(phrase);
    expect(await page.locator('.site-nav a[aria-current="page"]').textContent()).toContain("Methods");
    await page.screenshot({ path: join(shotsDir, "methods.png"), fullPage: true });
    expect(await finish()).toEqual([]);
  });
});

describe("whole site", () => {
  const pages = ["", "methods/", ...arms.map((a) => `arms/${a.id}/`)];

  it("every page: links and assets resolve inside the base path; no figure called safe, compliant or approved", async () => {
    const seen = new Map<string, string>();
    for (const path of pages) {
      const { page, finish } = await open(path);
      const refs = await page.$$eval("a[href], link[href]", (els) => els.map((e) => e.getAttribute("href") ?? ""));
      for (const ref of refs) {
        if (ref.startsWith("#")) {
          expect(await page.locator(`[id="${ref.slice(1)}"]`).count(), `target of ${ref} on /${path}`).toBe(1);
          continue;
        }
        const url = new URL(ref, `${siteUrl}${path}`);
        expect(url.origin, `${ref} on /${path} stays on the site`).toBe(origin);
        expect(url.pathname.startsWith(basePath), `${ref} on /${path} is inside ${basePath}`).toBe(true);
        seen.set(url.origin + url.pathname, `/${path}`);
      }
      const body = (await page.locator("body").innerText()).replace(/\s+/g, " ");
      expect(body.match(/\b(safe|compliant|approved)\b/gi), `wording on /${path}`).toBeNull();
      expect(await finish()).toEqual([]);
    }
    for (const [url, from] of seen) {
      const res = await fetch(url, { redirect: "manual" });
      expect(res.status, `${url} (linked from ${from})`).toBe(200);
    }
  });

  it("has a Content-Security-Policy that blocks inline script and outside hosts", async () => {
    const { page, finish } = await open("");
    const csp = await page.locator('meta[http-equiv="Content-Security-Policy"]').getAttribute("content");
    expect(csp).toContain("default-src 'self'");
    expect(csp).toMatch(/script-src 'self'(;|$)/);
    expect(csp, "the built site needs no inline style either").not.toContain("unsafe-inline");
    expect(await page.locator("script:not([src])").count(), "inline scripts").toBe(0);
    const blocked = await page.evaluate(async () => {
      const s = document.createElement("script");
      s.textContent = "window.__armdexInlineRan = true;";
      document.body.append(s);
      const img = document.createElement("img");
      img.src = "https://example.invalid/pixel.png";
      document.body.append(img);
      await new Promise((r) => setTimeout(r, 200));
      return {
        ran: (window as unknown as { __armdexInlineRan?: boolean }).__armdexInlineRan === true,
        violations: (window as unknown as { __armdexCspViolations?: string[] }).__armdexCspViolations ?? [],
      };
    });
    expect(blocked.ran).toBe(false);
    expect(blocked.violations.join("\n")).toMatch(/script-src/);
    expect(blocked.violations.join("\n")).toMatch(/img-src.*example\.invalid/);
    const problems = await finish();
    // The watcher saw them too (a check on the harness itself): as console errors and as CSP violations.
    expect(problems.some((p) => p.startsWith("console error:"))).toBe(true);
    expect(problems.some((p) => p.startsWith("CSP violation:"))).toBe(true);
    // The two violations provoked above are expected; nothing else is.
    expect(
      problems.filter((p) => !/script-src|img-src|example\.invalid|inline script|Refused to load the image/i.test(p)),
    ).toEqual([]);
  });
});
