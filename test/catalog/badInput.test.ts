/**
 * The bad-input corpus: every file in test/fixtures/bad-arms/ is broken on purpose (one defect each, unless the point
 * is several at once) and ../bad-arms.expected.json lists the errors each must produce: file, JSON path and a message substring
 * that names what was expected and what was found. Messages are API: a change that weakens them fails here.
 */
import { execFile } from "node:child_process";
import { copyFile, mkdir, mkdtemp, readFile, readdir, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join, relative } from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { type ArmIssue, type LoadResult, formatIssue, loadArms } from "../../src/catalog";

const root = new URL("../..", import.meta.url).pathname;
const CORPUS = "test/fixtures/bad-arms";
const corpusDir = join(root, CORPUS);

interface Expected {
  readonly file: string;
  readonly path: string;
  readonly messageIncludes: string;
}

const run = promisify(execFile);

/** Runs the CLI through tsx like the build script does; resolves with the exit code instead of rejecting. */
async function armdex(
  args: string[],
  env: NodeJS.ProcessEnv = process.env,
): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const { stdout, stderr } = await run("npx", ["tsx", "src/cli/armdex.ts", ...args], {
      cwd: root,
      env,
      maxBuffer: 16 * 1024 * 1024,
    });
    return { code: 0, stdout, stderr };
  } catch (e) {
    const err = e as { code?: unknown; stdout?: string; stderr?: string };
    if (typeof err.code !== "number") throw e;
    return { code: err.code, stdout: err.stdout ?? "", stderr: err.stderr ?? "" };
  }
}

/** The file name as the loader reports it (relative to the working directory). */
const reported = (file: string) => relative(process.cwd(), join(corpusDir, file));

let manifest: Expected[];
let files: string[];
let result: LoadResult;
const byFile = new Map<string, ArmIssue[]>();

beforeAll(async () => {
  // Git keeps the directory named folder.json only through its .gitkeep; recreate it if an export dropped it.
  await mkdir(join(corpusDir, "folder.json"), { recursive: true });
  manifest = JSON.parse(await readFile(`${corpusDir}.expected.json`, "utf8")) as Expected[];
  files = (await readdir(corpusDir)).filter((f) => f.toLowerCase().endsWith(".json")).sort();
  result = await loadArms([corpusDir]);
  for (const issue of result.issues) byFile.set(issue.file, [...(byFile.get(issue.file) ?? []), issue]);
});

describe("the bad-input corpus", () => {
  it("loads no valid arm from it", () => {
    expect(result.arms.map((a) => a.id)).toEqual([]);
  });

  it("gives every file in the folder at least one error", () => {
    expect(files.length, "the corpus keeps at least 40 broken files").toBeGreaterThanOrEqual(41);
    const withoutError = files.filter((f) => !(byFile.get(reported(f)) ?? []).some((i) => i.severity === "error"));
    expect(withoutError).toEqual([]);
  });

  it("reports every expected error with its file, JSON path and message", () => {
    // Guard on the manifest itself, so this check stays specific: no one-word substrings that any message would match.
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

  it("reports nothing beyond the manifest: every error of every file is one the manifest expects", () => {
    // A file with an unexpected extra error (a cascade from the first problem, a rule firing on valid input, a file
    // missing from the manifest) fails here. A defect repeated on every joint is listed once: joint indices aside.
    const anyJoint = (path: string) => path.replace(/^joints\[\d+\]/, "joints[*]");
    const unexpected = result.issues
      .filter((i) => i.severity === "error")
      .filter(
        (i) =>
          !manifest.some(
            (e) =>
              reported(e.file) === i.file &&
              anyJoint(e.path) === anyJoint(i.path) &&
              i.message.includes(e.messageIncludes),
          ),
      )
      .map(formatIssue);
    expect(unexpected).toEqual([]);
    expect(result.issues.filter((i) => i.severity === "error").length).toBeGreaterThanOrEqual(manifest.length);
  });

  it("names a copied file that kept another file's id as a duplicate", () => {
    const second = byFile.get(reported("duplicate-id-2.json")) ?? [];
    expect(second.map((i) => i.message)).toContain(
      `expected a unique id, found "duplicate-id" which ${reported("duplicate-id-1.json")} already uses`,
    );
    // The first claimant is not called a duplicate of the second.
    expect((byFile.get(reported("duplicate-id-1.json")) ?? []).filter((i) => i.message.includes("unique id"))).toEqual(
      [],
    );
  });
});

describe("armdex check on the corpus", () => {
  it("exits 1 and lists the errors of every file at once on stderr", async () => {
    const { code, stdout, stderr } = await armdex(["check", CORPUS]);
    expect(code).toBe(1);
    const lines = stderr.split("\n").filter((l) => l.startsWith("error: "));
    for (const file of files) {
      expect(
        lines.some((l) => l.startsWith(`error: ${CORPUS}/${file}: `)),
        `stderr names ${file}`,
      ).toBe(true);
    }
    for (const e of manifest) {
      const prefix = `error: ${CORPUS}/${e.file}: ${e.path ? `${e.path}: ` : ""}`;
      expect(
        lines.some((l) => l.startsWith(prefix) && l.includes(e.messageIncludes)),
        `${prefix}${e.messageIncludes}`,
      ).toBe(true);
    }
    const errorCount = result.issues.filter((i) => i.severity === "error").length;
    expect(lines.length).toBe(errorCount);
    expect(stdout).toContain(`0 arms valid; ${errorCount} errors in ${files.length} file(s)`);
  }, 60_000);
});

describe("the build on a catalog with one bad file (ARMDEX_ARMS_DIR)", () => {
  // `npm run build` (src/cli/build.ts) runs `armdex schema`, then `armdex check` on ARMDEX_ARMS_DIR, and only then
  // the analyses and Astro: a failing check stops it before anything is written. The copy keeps the demo files'
  // relative $schema path valid by copying the schema beside it.
  let tmp: string;
  let armsDir: string;

  beforeAll(async () => {
    tmp = await mkdtemp(join(tmpdir(), "armdex-bad-build-"));
    armsDir = join(tmp, "arms");
    await mkdir(armsDir);
    await mkdir(join(tmp, "public", "schema"), { recursive: true });
    await copyFile(join(root, "public", "schema", "arm.schema.json"), join(tmp, "public", "schema", "arm.schema.json"));
    for (const f of await readdir(join(root, "arms")))
      if (f.endsWith(".json")) await copyFile(join(root, "arms", f), join(armsDir, f));
  });

  afterAll(async () => {
    if (tmp) await rm(tmp, { recursive: true, force: true });
  });

  it("passes on a copy of the demo catalog and fails with exit 1 once one bad file is added, naming only that file", async () => {
    const env = { ...process.env, ARMDEX_ARMS_DIR: armsDir };
    const clean = await armdex(["check"], env);
    expect(clean.code, clean.stderr).toBe(0);
    const demoCount = (await readdir(armsDir)).length;
    expect(clean.stdout).toContain(`${demoCount} arms valid; 0 errors`);

    await writeFile(join(armsDir, "range-reversed.json"), await readFile(join(corpusDir, "range-reversed.json")));
    const broken = await armdex(["check"], env);
    expect(broken.code).toBe(1);
    const lines = broken.stderr.split("\n").filter((l) => l.startsWith("error: "));
    expect(lines.length).toBeGreaterThan(0);
    for (const l of lines) expect(l).toContain("range-reversed.json: ");
    expect(broken.stderr).toContain("joints[1].rangeDeg: expected [min, max] with min < max (deg), found [140,-110]");
    expect(broken.stdout).toContain(
      `${demoCount} arms valid; ${lines.length} error${lines.length === 1 ? "" : "s"} in 1 file(s)`,
    );
  }, 60_000);

  it("npm run build stops at the check with a non-zero exit, before Astro, and leaves the previous site untouched", async () => {
    await writeFile(join(armsDir, "range-reversed.json"), await readFile(join(corpusDir, "range-reversed.json")));
    const outDir = join(tmp, "dist");
    await mkdir(outDir, { recursive: true });
    await writeFile(join(outDir, "index.html"), "previous site\n");
    let code = 0;
    let stderr = "";
    try {
      await run("npm", ["run", "build"], {
        cwd: root,
        env: { ...process.env, ARMDEX_ARMS_DIR: armsDir, ARMDEX_OUT_DIR: outDir },
        maxBuffer: 16 * 1024 * 1024,
      });
    } catch (e) {
      const err = e as { code?: unknown; stderr?: string };
      code = typeof err.code === "number" ? err.code : -1;
      stderr = err.stderr ?? "";
    }
    expect(code).not.toBe(0);
    expect(stderr).toContain(
      "range-reversed.json: joints[1].rangeDeg: expected [min, max] with min < max (deg), found [140,-110]",
    );
    expect(stderr).toContain('build stopped at "armdex prepare"');
    expect(await readdir(outDir)).toEqual(["index.html"]);
    expect(await readFile(join(outDir, "index.html"), "utf8")).toBe("previous site\n");
    // Nothing half-built beside it.
    expect((await readdir(tmp)).filter((f) => f.startsWith("dist."))).toEqual([]);
  }, 120_000);
});
