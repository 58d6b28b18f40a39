/**
 * Headless system Chromium through playwright-core, and a watcher that records what a user would count as broken:
 * console errors, uncaught exceptions, Content-Security-Policy violations, failed requests, requests to other hosts.
 */
import { chromium, type Browser, type Page } from "playwright-core";

export const CHROMIUM_ARGS = [
  "--no-sandbox",
  "--disable-gpu",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--no-first-run",
] as const;

export function launchChromium(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    args: [...CHROMIUM_ARGS],
  });
}

export interface PageProblems {
  readonly consoleErrors: string[];
  readonly pageErrors: string[];
  readonly cspViolations: string[];
  readonly failedRequests: string[];
  readonly foreignRequests: string[];
}

declare global {
  interface Window {
    __armdexCspViolations?: string[];
  }
}

/** Starts recording problems on `page`; call before the first navigation. */
export async function watchPage(page: Page, origin: string): Promise<PageProblems> {
  const problems: PageProblems = {
    consoleErrors: [],
    pageErrors: [],
    cspViolations: [],
    failedRequests: [],
    foreignRequests: [],
  };
  // Init scripts run outside the page's CSP, so recording violations does not itself need an inline script.
  await page.addInitScript(() => {
    window.__armdexCspViolations = [];
    document.addEventListener("securitypolicyviolation", (e) => {
      window.__armdexCspViolations?.push(
        `${e.violatedDirective} blocked ${e.blockedURI || "inline"} (${e.sourceFile}:${e.lineNumber})`,
      );
    });
  });
  page.on("console", (msg) => {
    if (msg.type() === "error") problems.consoleErrors.push(`${msg.text()} @ ${msg.location().url}`);
  });
  page.on("pageerror", (err) => problems.pageErrors.push(err.message));
  page.on("request", (req) => {
    const url = req.url();
    if (!url.startsWith(`${origin}/`) && !url.startsWith("data:") && !url.startsWith("about:"))
      problems.foreignRequests.push(url);
  });
  // A request the page cancelled itself (net::ERR_ABORTED: a reload or navigation while the favicon was still on its
  // way) is not a breakage; a missing file shows as an HTTP status below, a refused one as another net error.
  page.on("requestfailed", (req) => {
    const error = req.failure()?.errorText ?? "failed";
    if (!error.includes("ERR_ABORTED")) problems.failedRequests.push(`${req.url()}: ${error}`);
  });
  page.on("response", (res) => {
    if (res.status() >= 400) problems.failedRequests.push(`${res.url()}: HTTP ${res.status()}`);
  });
  return problems;
}

/** CSP violations recorded in the current document. */
export async function cspViolationsIn(page: Page): Promise<string[]> {
  return page.evaluate(() => window.__armdexCspViolations ?? []);
}

/** Problems plus the CSP violations of the current document, as one flat list (empty when all is well). */
export async function collectProblems(page: Page, problems: PageProblems): Promise<string[]> {
  const csp = await cspViolationsIn(page);
  return [
    ...problems.consoleErrors.map((m) => `console error: ${m}`),
    ...problems.pageErrors.map((m) => `page error: ${m}`),
    ...[...problems.cspViolations, ...csp].map((m) => `CSP violation: ${m}`),
    ...problems.failedRequests.map((m) => `failed request: ${m}`),
    ...problems.foreignRequests.map((m) => `request to another host: ${m}`),
  ];
}

/** A page opened with openWatched. */
export interface WatchedPage {
  readonly page: Page;
  /** HTTP status of the navigation (null when there was no response). */
  readonly status: number | null;
  /** Closes the page and returns its problems (collectProblems). */
  finish(): Promise<string[]>;
}

/** Opens `url` in a new page (from `newPage`) with a problem watcher, waiting for the load event. */
export async function openWatched(newPage: () => Promise<Page>, url: string, origin: string): Promise<WatchedPage> {
  const page = await newPage();
  const problems = await watchPage(page, origin);
  const response = await page.goto(url, { waitUntil: "load" });
  return {
    page,
    status: response?.status() ?? null,
    async finish() {
      const list = await collectProblems(page, problems);
      await page.close();
      return list;
    },
  };
}
