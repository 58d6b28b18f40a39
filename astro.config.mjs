// Static site. ARMDEX_SITE (e.g. https://tools.example.internal) and ARMDEX_BASE (e.g. /tools/armdex/) let the team
// host it under a sub-path; every internal link goes through import.meta.env.BASE_URL (src/view/links.ts).
import { defineConfig } from "astro/config";
import mdx from "@astrojs/mdx";

export default defineConfig({
  site: process.env.ARMDEX_SITE || undefined,
  base: process.env.ARMDEX_BASE || "/",
  output: "static",
  trailingSlash: "always",
  build: {
    format: "directory",
    // The Content-Security-Policy forbids inline script and style: keep every script and stylesheet in a file.
    inlineStylesheets: "never",
  },
  vite: { build: { assetsInlineLimit: 0 } },
  // Code blocks without inline colour styles (see the CSP); our stylesheet formats them.
  markdown: { syntaxHighlight: false },
  integrations: [mdx()],
  devToolbar: { enabled: false },
});
