/**
 * The environment for a site build started from the browser suite: ours plus `extra`, minus what vitest adds for
 * its own tests. Vitest sets BASE_URL, MODE, DEV, PROD, SSR and NODE_ENV=test in process.env; Astro reads
 * process.env into import.meta.env, so a leaked BASE_URL would override the configured base path of every link.
 */
export function buildEnv(extra: Readonly<Record<string, string>> = {}): NodeJS.ProcessEnv {
  const env: NodeJS.ProcessEnv = { ...process.env, ...extra, ASTRO_TELEMETRY_DISABLED: "1" };
  for (const key of [
    "BASE_URL",
    "MODE",
    "DEV",
    "PROD",
    "SSR",
    "TEST",
    "VITEST",
    "VITEST_MODE",
    "VITEST_POOL_ID",
    "VITEST_WORKER_ID",
  ]) {
    delete env[key];
  }
  if (env.NODE_ENV === "test") delete env.NODE_ENV;
  return env;
}
