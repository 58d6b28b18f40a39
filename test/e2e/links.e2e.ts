/**
 * Link check of the whole built site: starting from the home page, every page reachable through links is opened in
 * Chromium (JavaScript on, so links built on the client count too) and every reference in it is followed:
 *   - links and assets (href, src, srcset, poster, object data, form action, SVG href, meta refresh) answer HTTP 200
 *     from the test server, with no redirect;
 *   - a #fragment names an element id (or <a name>) of the target page (bare "#" and "#top" mean the top, as in HTML);
 *   - url(…) and @import in the site's stylesheets resolve too, used by the page or not;
 *   - nothing the browser requested while loading a page failed;
 *   - assets come from the site itself; links to other hosts are listed, not fetched (no network in tests).
 * site.e2e.ts checks what a user sees on a fixed list of pages; this file owns the crawl.
 */
import { mkdtemp, mkdir, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { readArmFiles } from "./helpers/armFiles";
import { launchChromium, watchPage } from "./helpers/browser";
import { serveStatic } from "./helpers/staticServer";

const root = new URL("../..", import.meta.url).pathname;
const MAX_PAGES = 5000;

/** One reference found in a page. */
interface Ref {
  readonly tag: string;
  readonly attr: string;
  readonly raw: string;
  /** Absolute URL ("" when the value does not parse as a URL). */
  readonly url: string;
  /** A link the crawl follows to another page (a, area, iframe, meta refresh). */
  readonly nav: boolean;
}

interface Broken {
  /** The target, absolute, with its fragment when the fragment is what is missing. */
  readonly url: string;
  /** The page or stylesheet that refers to it. */
  readonly from: string;
  readonly reason: string;
}

interface CrawlReport {
  /** Every HTML page visited, absolute URLs without fragment. */
  readonly pages: string[];
  /** Number of distinct internal URLs fetched (pages, assets, downloads). */
  readonly fetched: number;
  /** Links to other hosts, not fetched. */
  readonly external: string[];
  readonly broken: Broken[];
}

interface Resource {
  readonly status: number;
  readonly type: string;
  readonly text: string | null;
}

const withoutHash = (url: string) => url.split("#")[0]!;

/** Crawls the site from `start`; reports every broken internal link, anchor and asset. */
async function crawlSite(browser: Browser, start: string, origin: string): Promise<CrawlReport> {
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
  const resources = new Map<string, Promise<Resource>>();
  const ids = new Map<string, Set<string>>();
  const anchors: { url: string; from: string; raw: string }[] = [];
  const broken: Broken[] = [];
  const external = new Set<string>();
  const scannedCss = new Set<string>();
  const queue: string[] = [withoutHash(start)];
  const queued = new Set(queue);

  const fetchOnce = (url: string): Promise<Resource> => {
    let p = resources.get(url);
    if (!p) {
      p = fetch(url, { redirect: "manual" }).then(async (res) => {
        const type = res.headers.get("content-type") ?? "";
        const text = /text\/(html|css)/.test(type) ? await res.text() : (await res.arrayBuffer(), null);
        return { status: res.status, type, text };
      });
      resources.set(url, p);
    }
    return p;
  };

  /** Checks one reference; queues the target when it is a page not seen yet. */
  const check = async (ref: Ref, from: string): Promise<void> => {
    const label = `<${ref.tag} ${ref.attr}="${ref.raw}">`;
    if (!ref.url) {
      broken.push({ url: ref.raw, from, reason: `${label} is not a valid URL` });
      return;
    }
    const url = new URL(ref.url);
    if (url.protocol === "data:" || url.protocol === "mailto:" || url.protocol === "tel:") return;
    if (url.protocol === "javascript:") {
      broken.push({
        url: ref.url,
        from,
        reason: `${label}: a javascript: URL (the Content-Security-Policy blocks it)`,
      });
      return;
    }
    if (url.origin !== origin) {
      if (ref.nav) external.add(ref.url);
      else broken.push({ url: ref.url, from, reason: `${label}: an asset from another host` });
      return;
    }
    const target = withoutHash(ref.url);
    const res = await fetchOnce(target);
    if (res.status !== 200) {
      broken.push({ url: target, from, reason: `${label}: HTTP ${res.status}` });
      return;
    }
    const isHtml = res.type.startsWith("text/html");
    if (url.hash && isHtml) anchors.push({ url: ref.url, from, raw: ref.raw });
    if (ref.nav && isHtml && !queued.has(target)) {
      queued.add(target);
      queue.push(target);
    }
    if (res.type.startsWith("text/css") && res.text !== null && !scannedCss.has(target)) {
      scannedCss.add(target);
      for (const raw of cssReferences(res.text)) {
        let resolved = "";
        try {
          resolved = new URL(raw, target).href;
        } catch {
          /* reported below */
        }
        await check({ tag: "css", attr: "url", raw, url: resolved, nav: false }, target);
      }
    }
  };

  try {
    while (queue.length > 0 && ids.size < MAX_PAGES) {
      const pageUrl = queue.shift()!;
      const res = await fetchOnce(pageUrl);
      if (res.status !== 200) {
        if (pageUrl === withoutHash(start))
          broken.push({ url: pageUrl, from: "(start)", reason: `HTTP ${res.status}` });
        continue;
      }
      const page = await context.newPage();
      const problems = await watchPage(page, origin);
      await page.goto(pageUrl, { waitUntil: "load" });
      const found = await page.evaluate(extractFromDocument);
      await page.close();
      ids.set(pageUrl, new Set(found.ids));
      for (const failed of problems.failedRequests) {
        const cut = failed.indexOf(": ");
        broken.push({
          url: failed.slice(0, cut),
          from: pageUrl,
          reason: `the browser could not load it: ${failed.slice(cut + 2)}`,
        });
      }
      for (const ref of found.refs) await check(ref, pageUrl);
    }
  } finally {
    await context.close();
  }

  for (const a of anchors) {
    const url = new URL(a.url);
    const id = decodeURIComponent(url.hash.slice(1));
    if (id === "" || id.toLowerCase() === "top") continue;
    const targetIds = ids.get(withoutHash(a.url));
    // Pages are crawled through nav links only; an anchor on a page reached another way is looked up on demand.
    const known = targetIds ?? new Set((await idsOf(browser, withoutHash(a.url))) ?? []);
    if (!known.has(id))
      broken.push({
        url: a.url,
        from: a.from,
        reason: `<a href="${a.raw}">: no element with id "${id}" on the target page`,
      });
  }

  // One line per broken target and reason, naming up to three places that refer to it.
  const merged = new Map<string, { url: string; reason: string; from: string[] }>();
  for (const b of broken) {
    const key = `${b.url}\u0000${b.reason}`;
    const entry = merged.get(key) ?? { url: b.url, reason: b.reason, from: [] };
    if (!entry.from.includes(b.from)) entry.from.push(b.from);
    merged.set(key, entry);
  }
  const list = [...merged.values()].map((m) => ({
    url: m.url,
    reason: m.reason,
    from: m.from.length > 3 ? `${m.from.slice(0, 3).join(", ")} and ${m.from.length - 3} more` : m.from.join(", "),
  }));
  return { pages: [...ids.keys()], fetched: resources.size, external: [...external], broken: list };
}

async function idsOf(browser: Browser, url: string): Promise<string[] | null> {
  const page = await browser.newPage();
  try {
    await page.goto(url, { waitUntil: "load" });
    return (await page.evaluate(extractFromDocument)).ids;
  } finally {
    await page.close();
  }
}

/** url(…) and @import targets of a stylesheet (comments removed first). */
function cssReferences(css: string): string[] {
  const text = css.replace(/\/\*[\s\S]*?\*\//g, "");
  const out: string[] = [];
  for (const m of text.matchAll(/url\(\s*(?:"([^"]*)"|'([^']*)'|([^)'"\s]*))\s*\)/g))
    out.push((m[1] ?? m[2] ?? m[3] ?? "").trim());
  for (const m of text.matchAll(/@import\s+(?:"([^"]*)"|'([^']*)')/g)) out.push(m[1] ?? m[2] ?? "");
  return out.filter((u) => u !== "" && !u.startsWith("#"));
}

/** Runs in the page: every reference with its resolved URL, and every id (or a[name]) of the document. */
function extractFromDocument(): { refs: Ref[]; ids: string[] } {
  const refs: Ref[] = [];
  const add = (el: Element, attr: string, raw: string, nav: boolean) => {
    let url = "";
    try {
      url = new URL(raw.trim(), document.baseURI).href;
    } catch {
      url = "";
    }
    refs.push({ tag: el.tagName.toLowerCase(), attr, raw, url, nav });
  };
  for (const el of Array.from(document.querySelectorAll("*"))) {
    const tag = el.tagName.toLowerCase();
    for (const attr of Array.from(el.attributes)) {
      const name = attr.name.toLowerCase();
      if (name === "href" || name === "xlink:href") add(el, name, attr.value, tag === "a" || tag === "area");
      else if (name === "src") add(el, name, attr.value, tag === "iframe");
      else if (name === "poster" || (name === "data" && tag === "object") || (name === "action" && tag === "form"))
        add(el, name, attr.value, false);
      else if (name === "srcset" || name === "imagesrcset") {
        for (const candidate of attr.value.split(/,\s+/)) {
          const u = candidate.trim().split(/\s+/)[0];
          if (u) add(el, name, u, false);
        }
      }
    }
    if (tag === "meta" && el.getAttribute("http-equiv")?.toLowerCase() === "refresh") {
      const m = /url\s*=\s*['"]?([^'"]+)/i.exec(el.getAttribute("content") ?? "");
      if (m) add(el, "content", m[1]!, true);
    }
  }
  const ids = [
    ...Array.from(document.querySelectorAll("[id]"), (e) => e.id),
    ...Array.from(document.querySelectorAll("a[name]"), (e) => e.getAttribute("name") ?? ""),
  ];
  return { refs, ids };
}

let browser: Browser;

beforeAll(async () => {
  browser = await launchChromium();
});

afterAll(async () => {
  await browser?.close();
});

describe("link check", () => {
  it("finds every kind of breakage in a small site made for the purpose (a check on the crawler itself)", async () => {
    const dir = await mkdtemp(join(tmpdir(), "armdex-links-"));
    try {
      await mkdir(join(dir, "good"));
      await writeFile(
        join(dir, "index.html"),
        `<!doctype html><html><head><title>t</title><link rel="stylesheet" href="style.css"></head><body>
<a href="good/">fine</a> <a href="good/#here">fine anchor</a> <a href="#self">same page</a> <a href="#">top</a>
<a href="good/#nowhere">missing anchor</a> <a href="missing/">missing page</a> <a href="javascript:void(0)">script</a>
<a href="http://127.0.0.1:9/elsewhere/">another host</a> <img src="nope.png" alt=""> <img src="http://127.0.0.1:9/x.png" alt="">
<img srcset="pic.svg 1x, gone.svg 2x" alt=""> <p id="self">here</p></body></html>`,
      );
      await writeFile(
        join(dir, "good", "index.html"),
        `<!doctype html><title>g</title><h2 id="here">here</h2><a href="../">home</a><a href="../#self">back</a>`,
      );
      await writeFile(
        join(dir, "style.css"),
        `body { background: url("bg.svg"); } /* url(commented.svg) */ .unused { background: url(missing-bg.svg) }`,
      );
      const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="1" height="1"/>`;
      await writeFile(join(dir, "bg.svg"), svg);
      await writeFile(join(dir, "pic.svg"), svg);
      const server = await serveStatic(dir, "/");
      try {
        const report = await crawlSite(browser, server.siteUrl, server.origin);
        const s = server.siteUrl;
        expect(report.pages.sort()).toEqual([s, `${s}good/`]);
        expect(report.external).toEqual(["http://127.0.0.1:9/elsewhere/"]);
        expect([...new Set(report.broken.map((b) => b.url))].sort()).toEqual(
          [
            `${s}good/#nowhere`,
            `${s}missing/`,
            "javascript:void(0)",
            `${s}nope.png`,
            "http://127.0.0.1:9/x.png",
            `${s}gone.svg`,
            `${s}missing-bg.svg`,
          ].sort(),
        );
        expect(report.broken.find((b) => b.url === `${s}missing-bg.svg`)?.from).toBe(`${s}style.css`);
        expect(report.broken.find((b) => b.url === `${s}good/#nowhere`)?.reason).toContain(
          'no element with id "nowhere"',
        );
      } finally {
        await server.close();
      }
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });

  it("every page reachable from the home page: internal links, anchors and assets resolve", async () => {
    const siteUrl = inject("siteUrl");
    const report = await crawlSite(browser, siteUrl, inject("origin"));
    const reached = new Set(report.pages.map((p) => p.slice(siteUrl.length)));
    // The crawl really walked the site: the home page, the methods page and every arm sheet.
    for (const path of ["", "methods/", ...readArmFiles(root).map((a) => `arms/${a.id}/`)]) {
      expect(reached.has(path), `page /${path} reached from the home page`).toBe(true);
    }
    expect(report.fetched).toBeGreaterThan(report.pages.length);
    const lines = report.broken.map((b) => `${b.url} (from ${b.from}): ${b.reason}`);
    expect(lines).toEqual([]);
  }, 180_000);
});
