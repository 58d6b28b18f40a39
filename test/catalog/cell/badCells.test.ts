/**
 * The bad cell corpus: every file in test/fixtures/bad-cells/ is broken on purpose (one defect each) and
 * ../bad-cells.expected.json lists the error each must produce: file, JSON path and a message substring that names
 * what was expected and what was found. Messages are API. The cells are checked against the demo arm catalog (arms/).
 * Then the command line and the build on a copy of the demo catalog with one bad cell: exit 1, the error named with
 * its file and path, nothing published.
 */
import { execFile } from "node:child_process";
import { copyFile, mkdir, mkdtemp, readFile, readdir, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join, relative } from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { type ArmIssue, type CellLoadResult, formatIssue, loadArms, loadCells } from "../../../src/catalog";

const root = new URL("../../..", import.meta.url).pathname;
const corpusDir = join(root, "test/fixtures/bad-cells");
const run = promisify(execFile);

interface Expected {
  readonly file: string;
  readonly path: string;
  readonly messageIncludes: string;
}

/** Runs the CLI through tsx like the build does; resolves with the exit code instead of rejecting. */
async function armdex(args: string[], env: NodeJS.ProcessEnv = process.env) {
  try {
    const { stdout, stderr } = await run("npx", ["tsx", "src/cli/armdex.ts", ...args], { cwd: root, env });
    return { code: 0, stdout, stderr };
  } catch (e) {
    const err = e as { code?: unknown; stdout?: string; stderr?: string };
    if (typeof err.code !== "number") throw e;
    return { code: err.code, stdout: err.stdout ?? "", stderr: err.stderr ?? "" };
  }
}

const reported = (file: string) => relative(process.cwd(), join(corpusDir, file));

let manifest: Expected[];
let files: string[];
let result: CellLoadResult;
const byFile = new Map<string, ArmIssue[]>();

beforeAll(async () => {
  manifest = JSON.parse(await readFile(`${corpusDir}.expected.json`, "utf8")) as Expected[];
  files = (await readdir(corpusDir)).filter((f) => f.endsWith(".json")).sort();
  const { arms } = await loadArms([join(root, "arms")]);
  result = await loadCells(
    corpusDir,
    arms.map((a) => a.id),
  );
  for (const issue of result.issues) byFile.set(issue.file, [...(byFile.get(issue.file) ?? []), issue]);
});

describe("the bad cell corpus", () => {
  it("loads no valid cell, and gives every file at least one error", () => {
    expect(result.cells.map((c) => c.id)).toEqual([]);
    expect(files.length).toBeGreaterThanOrEqual(30);
    const withoutError = files.filter((f) => !(byFile.get(reported(f)) ?? []).some((i) => i.severity === "error"));
    expect(withoutError).toEqual([]);
  });

  it("reports every expected error with its file, JSON path and message", () => {
    expect(manifest.filter((e) => e.messageIncludes.length < 20)).toEqual([]);
    const missing = manifest.filter(
      (e) =>
        !(byFile.get(reported(e.file)) ?? []).some(
          (i) => i.severity === "error" && i.path === e.path && i.message.includes(e.messageIncludes),
        ),
    );
    const found = (e: Expected) => (byFile.get(reported(e.file)) ?? []).map(formatIssue).join("\n    ");
    expect(
      missing.map((e) => `${e.file} ${e.path || "(whole file)"}: ${e.messageIncludes}\n    got: ${found(e)}`),
    ).toEqual([]);
  });

  it("reports nothing beyond the manifest (no cascades), and covers every file of the folder", () => {
    const unexpected = result.issues
      .filter(
        (i) =>
          !manifest.some(
            (e) => reported(e.file) === i.file && e.path === i.path && i.message.includes(e.messageIncludes),
          ),
      )
      .map(formatIssue);
    expect(unexpected).toEqual([]);
    expect(new Set(manifest.map((e) => e.file))).toEqual(new Set(files));
  });
});

describe("armdex check and the build with one bad cell in a copy of the demo catalog", () => {
  // A copy of arms/ with its cells and the schemas beside it (so the demo files' relative $schema paths resolve).
  let tmp: string;
  let armsDir: string;
  let env: NodeJS.ProcessEnv;

  beforeAll(async () => {
    tmp = await mkdtemp(join(tmpdir(), "armdex-bad-cell-"));
    armsDir = join(tmp, "arms");
    await mkdir(join(armsDir, "cells"), { recursive: true });
    await mkdir(join(tmp, "public", "schema"), { recursive: true });
    for (const s of ["arm.schema.json", "cell.schema.json"])
      await copyFile(join(root, "public", "schema", s), join(tmp, "public", "schema", s));
    for (const f of await readdir(join(root, "arms")))
      if (f.endsWith(".json")) await copyFile(join(root, "arms", f), join(armsDir, f));
    for (const f of await readdir(join(root, "arms", "cells")))
      if (f.endsWith(".json")) await copyFile(join(root, "arms", "cells", f), join(armsDir, "cells", f));
    env = { ...process.env, ARMDEX_ARMS_DIR: armsDir };
  });

  afterAll(async () => {
    if (tmp) await rm(tmp, { recursive: true, force: true });
  });

  it("passes on the copy, then exits 1 naming only the bad cell once one is added", async () => {
    const clean = await armdex(["check"], env);
    expect(clean.code, clean.stderr).toBe(0);
    expect(clean.stdout).toContain("2 cells valid; 0 errors, 0 warnings");

    await writeFile(join(armsDir, "cells", "unknown-arm.json"), await readFile(join(corpusDir, "unknown-arm.json")));
    const broken = await armdex(["check"], env);
    expect(broken.code).toBe(1);
    const lines = broken.stderr.split("\n").filter((l) => l.startsWith("error: "));
    expect(lines.length).toBe(1);
    expect(lines[0]).toMatch(
      /^error: .*arms\/cells\/unknown-arm\.json: candidates\[1\]: expected the id of an arm in the catalog, found "acme-nonexistent-9"/,
    );
    expect(broken.stdout).toContain("2 cells valid; 1 error in 1 file(s), 0 warnings");
  }, 60_000);

  it("checks one cell file on its own against ARMDEX_ARMS_DIR", async () => {
    await writeFile(join(armsDir, "cells", "empty-cycle.json"), await readFile(join(corpusDir, "empty-cycle.json")));
    const one = await armdex(["check", join(armsDir, "cells", "empty-cycle.json")], env);
    expect(one.code).toBe(1);
    expect(one.stderr).toContain(
      "empty-cycle.json: cycle: expected at least one step (the cycle is the loop of moves the arm repeats), found an empty list",
    );
    expect(one.stdout).toBe("0 cells valid; 1 error in 1 file(s), 0 warnings\n");
    const good = await armdex(["check", join(armsDir, "cells", "demo-press-tending.json")], env);
    expect(good.code, good.stderr).toBe(0);
    expect(good.stdout).toBe("1 cell valid; 0 errors, 0 warnings\n");
  }, 60_000);

  it("npm run build stops at armdex prepare with the cell error and leaves the previous site untouched", async () => {
    await writeFile(
      join(armsDir, "cells", "release-never-gripped.json"),
      await readFile(join(corpusDir, "release-never-gripped.json")),
    );
    const outDir = join(tmp, "dist");
    await mkdir(outDir, { recursive: true });
    await writeFile(join(outDir, "index.html"), "previous site\n");
    let code = 0;
    let stderr = "";
    try {
      await run("npm", ["run", "build"], {
        cwd: root,
        env: { ...env, ARMDEX_OUT_DIR: outDir },
        maxBuffer: 16 * 1024 * 1024,
      });
    } catch (e) {
      const err = e as { code?: unknown; stderr?: string };
      code = typeof err.code === "number" ? err.code : -1;
      stderr = err.stderr ?? "";
    }
    expect(code).not.toBe(0);
    expect(stderr).toContain(
      "release-never-gripped.json: cycle[4].release: expected a part to be carried here, found empty hands",
    );
    expect(stderr).toContain('build stopped at "armdex prepare"');
    expect(await readdir(outDir)).toEqual(["index.html"]);
    expect(await readFile(join(outDir, "index.html"), "utf8")).toBe("previous site\n");
    expect((await readdir(tmp)).filter((f) => f.startsWith("dist."))).toEqual([]);
  }, 120_000);
});
