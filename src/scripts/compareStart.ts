/**
 * Entry of the side-by-side page. It has no static imports, so it runs as soon as it arrives: it starts fetching
 * the chosen arms' summaries at once, then loads the drawing code (compare.ts and its charts) while they travel.
 * The fetches are keyed by address; compare.ts takes a started fetch for an address instead of starting its own.
 */
const root = document.querySelector<HTMLElement>("[data-compare]");
if (root) {
  const early = new Map<string, Promise<Response>>();
  try {
    const config = JSON.parse(root.dataset.compare ?? "{}") as { arms?: { id: string; summaryHref: string }[] };
    const wanted = new Set((new URLSearchParams(location.search).get("arms") ?? "").split(",").map((s) => s.trim()));
    // At most six, as the page allows; anything else is left to compare.ts, which explains it.
    const hrefs = (config.arms ?? []).filter((a) => wanted.has(a.id)).map((a) => a.summaryHref);
    if (hrefs.length <= 6) for (const href of hrefs) early.set(href, fetch(href));
  } catch {
    // compare.ts reads the same configuration and reports what is wrong with it.
  }
  void import("./compare").then((m) => m.mountCompare(root, early));
}
