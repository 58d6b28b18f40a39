/**
 * `npm run build`: schema → check → analyse (cached, parallel) → astro build into a fresh temporary folder →
 * swap it in as dist/. A failed or interrupted build leaves the previous dist/ untouched: the new site appears in
 * one rename, or not at all. Invalid arm files stop the build before anything is written.
 */
import { spawn } from "node:child_process";
import { existsSync } from "node:fs";
import { rename, rm } from "node:fs/promises";
import { resolve } from "node:path";

const root = process.cwd();
const outDir = resolve(root, process.env.ARMDEX_OUT_DIR ?? "dist");
const tmpDir = `${outDir}.building-${process.pid}`;
const oldDir = `${outDir}.previous-${process.pid}`;
let child: ReturnType<typeof spawn> | null = null;
let interrupted = false;

function run(command: string, args: string[]): Promise<number> {
  return new Promise((done) => {
    child = spawn(command, args, { stdio: "inherit", env: process.env });
    child.on("exit", (code, signal) => {
      child = null;
      done(code ?? (signal ? 130 : 1));
    });
  });
}

async function cleanup(): Promise<void> {
  await rm(tmpDir, { recursive: true, force: true });
}

for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.on(signal, () => {
    interrupted = true;
    child?.kill(signal);
    void cleanup().then(() => process.exit(130));
  });
}

async function main(): Promise<number> {
  const tsx = resolve(root, "node_modules/.bin/tsx");
  const astro = resolve(root, "node_modules/.bin/astro");
  const cli = resolve(root, "src/cli/armdex.ts");
  for (const step of [["schema"], ["check"], ["analyze", "--all"]]) {
    const code = await run(tsx, [cli, ...step]);
    if (code !== 0 || interrupted) {
      process.stderr.write(`build stopped at "armdex ${step.join(" ")}"; ${existsSync(outDir) ? "the previous site in dist/ is unchanged" : "nothing was published"}\n`);
      return code || 1;
    }
  }
  await cleanup();
  const code = await run(astro, ["build", "--outDir", tmpDir]);
  if (code !== 0 || interrupted) {
    await cleanup();
    process.stderr.write(`astro build failed; ${existsSync(outDir) ? "the previous site in dist/ is unchanged" : "nothing was published"}\n`);
    return code || 1;
  }
  // Swap: the old site moves aside, the new one takes its name, the old one is removed.
  const hadOld = existsSync(outDir);
  if (hadOld) await rename(outDir, oldDir);
  try {
    await rename(tmpDir, outDir);
  } catch (e) {
    // Put the previous site back rather than leave none.
    if (hadOld) await rename(oldDir, outDir);
    throw e;
  }
  await rm(oldDir, { recursive: true, force: true });
  process.stdout.write(`site written to ${outDir}\n`);
  return 0;
}

main().then(
  (code) => process.exit(code),
  async (e: unknown) => {
    await cleanup();
    process.stderr.write(`build failed: ${e instanceof Error ? e.message : String(e)}\n`);
    process.exit(1);
  },
);
