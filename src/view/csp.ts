/**
 * The Content-Security-Policy the layout writes as a <meta> tag. The built site runs no inline script or style and
 * loads nothing from other hosts; Astro is configured (astro.config.mjs) never to inline scripts or stylesheets.
 * Charts must colour through CSS classes, not style attributes. Directives that a <meta> policy ignores
 * (frame-ancestors, report-uri, sandbox) are left out: Chromium would log an error for each.
 */
export function contentSecurityPolicy(options: { readonly dev: boolean }): string {
  return [
    "default-src 'self'",
    "script-src 'self'",
    // The dev server injects component styles with JavaScript; the built site needs no inline style.
    options.dev ? "style-src 'self' 'unsafe-inline'" : "style-src 'self'",
    "img-src 'self' data:",
    "font-src 'self'",
    options.dev ? "connect-src 'self' ws: wss:" : "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
  ].join("; ");
}
