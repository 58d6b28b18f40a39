/**
 * Imported first by browser modules that validate with zod: zod then never builds parsers with `new Function`, nor
 * probes whether it may. The site's Content-Security-Policy forbids eval (script-src 'self'), and Chromium reports
 * the probe as a CSP violation even though zod catches the error. Must run before any zod schema is built, so it is
 * the first import of the module that needs it.
 */
import { config } from "zod";

config({ jitless: true });
