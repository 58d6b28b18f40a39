/**
 * Site-internal links. Every href the pages write goes through `siteHref`, so the site works under any base path
 * (ARMDEX_BASE, e.g. "/tools/armdex/"). Paths are directories and end in "/" (trailingSlash "always").
 */

/**
 * Joins the site base (import.meta.env.BASE_URL) and a site path.
 * @example siteHref("/", "arms/a6-900/") // "/arms/a6-900/"
 * @example siteHref("/tools/armdex", "/methods/") // "/tools/armdex/methods/"
 * @example siteHref("/tools/armdex/", "") // "/tools/armdex/"
 */
export function siteHref(baseUrl: string, path: string): string {
  const base = `/${baseUrl.replace(/^\/+|\/+$/g, "")}/`.replace(/^\/\/$/, "/");
  const [pathPart = "", fragment] = path.split("#", 2);
  const rel = pathPart.replace(/^\/+/, "");
  return `${base}${rel}${fragment !== undefined ? `#${fragment}` : ""}`;
}

/** Site path of an arm sheet. */
export function armPath(id: string): string {
  return `arms/${encodeURIComponent(id)}/`;
}

/** Absolute URL of a page when the site address is configured (ARMDEX_SITE), else null. */
export function absoluteUrl(site: URL | string | undefined, href: string): string | null {
  if (site === undefined) return null;
  return new URL(href, site).href;
}
