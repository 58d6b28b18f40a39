/**
 * `npm run build`: schema → check → analyse (cached, parallel; one process: `armdex prepare`) → astro build into a fresh temporary folder →
 * swap it in as dist/. A failed or interrupted build leaves the previous dist/ untouched: the new site appears in
 * one rename, or not at all. Invalid arm files stop the build before anything is written.
 */
import { spawn } from "node:child_process";
import { existsSync } from "node:fs";
import { readdir, rename, rm } from "node:fs/promises";
import { basename, dirname, resolve } from "node:path";

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

/**
 * Removes this build's temporary folder. Called once the step that wrote it has exited; a second pass after a short
 * pause catches files a dying process still flushed while the first pass ran.
 */
async function cleanup(): Promise<void> {
  await rm(tmpDir, { recursive: true, force: true, maxRetries: 3 });
  if (existsSync(tmpDir) || interrupted) {
    await new Promise((r) => setTimeout(r, 250));
    await rm(tmpDir, { recursive: true, force: true, maxRetries: 3 });
  }
}

/**
 * Folders of earlier builds killed outright (SIGKILL, power loss): a temporary folder was never published and is
 * removed; a set-aside previous site is restored when no site took its place, else removed.
 */
async function removeStaleFolders(): Promise<void> {
  const parent = dirname(outDir);
  if (!existsSync(parent)) return;
  const pattern = new RegExp(
    `^${basename(outDir).replace(/[.*+?^${}()|[\]\\]/g, "\\$&")}\\.(building|previous)-(\\d+)$`,
  );
  for (const name of await readdir(parent)) {
    const m = pattern.exec(name);
    if (!m || Number(m[2]) === process.pid || isAlive(Number(m[2]))) continue;
    // Killed between the two renames of a swap: the set-aside folder is the last published site; put it back.
    if (m[1] === "previous" && !existsSync(outDir)) await rename(resolve(parent, name), outDir);
    else await rm(resolve(parent, name), { recursive: true, force: true });
  }
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    return (e as NodeJS.ErrnoException).code === "EPERM";
  }
}

// An interrupt stops the running step; the main flow then removes the temporary folder once that step has exited
// (removing it while Astro still writes would race) and leaves dist/ as it was. A signal that arrives during the
// final swap waits for it: the two renames finish, so dist/ is the old site or the new one, never neither.
for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.on(signal, () => {
    if (interrupted) return;
    interrupted = true;
    process.stderr.write(`build interrupted (${signal})\n`);
    child?.kill(signal);
  });
}

/** "step armdex check: 1.2 s": the time of each step, for the scale bench (test/bench/scale.ts) and the curious. */
function stepTime(name: string, t0: number): void {
  process.stdout.write(`step ${name}: ${((performance.now() - t0) / 1000).toFixed(1)} s\n`);
}

async function main(): Promise<number> {
  const tsx = resolve(root, "node_modules/.bin/tsx");
  const astro = resolve(root, "node_modules/.bin/astro");
  const cli = resolve(root, "src/cli/armdex.ts");
  await removeStaleFolders();
  // One process reads and validates each arm file once: schema, check, analyses (the Astro build reads them again in
  // its own process).
  for (const step of [["prepare"]]) {
    const t0 = performance.now();
    const code = await run(tsx, [cli, ...step]);
    stepTime(`armdex ${step.join(" ")}`, t0);
    if (code !== 0 || interrupted) {
      process.stderr.write(
        `build stopped at "armdex ${step.join(" ")}"; ${existsSync(outDir) ? "the previous site in dist/ is unchanged" : "nothing was published"}\n`,
      );
      return interrupted ? 130 : code || 1;
    }
  }
  await cleanup();
  const t0 = performance.now();
  const code = interrupted ? 130 : await run(astro, ["build", "--outDir", tmpDir]);
  stepTime("astro build", t0);
  if (code !== 0 || interrupted) {
    await cleanup();
    process.stderr.write(
      `astro build ${interrupted ? "interrupted" : "failed"}; ${existsSync(outDir) ? "the previous site in dist/ is unchanged" : "nothing was published"}\n`,
    );
    return interrupted ? 130 : code || 1;
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
