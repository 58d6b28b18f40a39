/** Props of the shared layout: site name, navigation and footer. */
import { CAUTIONS } from "./cautions";
import { siteHref } from "./links";

export const SITE_NAME = "Armdex";
export const SITE_TAGLINE = "Industrial robot arms, compared from their declared parameters";

export type NavKey = "catalog" | "cells" | "methods";

export interface NavItem {
  readonly key: NavKey;
  readonly label: string;
  readonly href: string;
}

export interface SiteModel {
  readonly name: string;
  readonly tagline: string;
  readonly homeHref: string;
  readonly nav: readonly NavItem[];
  readonly cautionsSummary: string;
  readonly cautionsHref: string;
  readonly faviconHref: string;
  /** The arm file format (written to public/schema/ by `armdex schema` in the build script). */
  readonly schemaHref: string;
}

export function siteModel(baseUrl: string): SiteModel {
  return {
    name: SITE_NAME,
    tagline: SITE_TAGLINE,
    homeHref: siteHref(baseUrl, ""),
    nav: [
      { key: "catalog", label: "Catalog", href: siteHref(baseUrl, "") },
      { key: "cells", label: "Cell studies", href: siteHref(baseUrl, "cells/") },
      { key: "methods", label: "Methods", href: siteHref(baseUrl, "methods/") },
    ],
    cautionsSummary: CAUTIONS.summary,
    cautionsHref: siteHref(baseUrl, "methods/#cautions"),
    faviconHref: siteHref(baseUrl, "favicon.svg"),
    schemaHref: siteHref(baseUrl, "schema/arm.schema.json"),
  };
}
