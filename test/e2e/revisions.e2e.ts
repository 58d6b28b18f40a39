/**
 * Pinned revisions through real site builds (`npm run build`), from a catalog kept in a throwaway git repository in
 * a temporary folder (ARMDEX_ARMS_DIR): a SCARA (quick to analyse) is committed, its J1 speed changed and committed,
 * then changed again without a commit. The site is built after the second commit and again after the uncommitted
 * change, each build into its own folder with an empty analysis cache of its own.
 *
 * Checks (issue 15): three revision pages exist, each with the maximum tool speed of its own J1 speed; the revisions
 * list names the field with old and new values; the oldest page is byte-identical to the one the earlier build
 * produced; a revision that no longer validates has a page that says so, and the build does not fail for it.
 *
 * Maximum tool speed of this SCARA, by hand: link lengths a1 = 325 mm and a2 = 275 mm, J2 at 300 deg/s, J3 (vertical
 * stroke) at 1100 mm/s, the flange centre on the J4 axis. The flange speed from J1 and J2 is largest with the arm
 * stretched (θ2 = 0, inside J2's range), where both joints move it in the same direction:
 * v_plane = ω1·(a1 + a2) + ω2·a2; J3 adds a vertical component at right angles: v = √(v_plane² + v_z²).
 * The checks read the built files; the last one opens the sheet in Chromium for the copy button (the site the suite
 * serves is not used).
 */
import { spawnSync } from "node:child_process";
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { buildEnv } from "./helpers/buildEnv";
import { collectProblems, launchChromium, watchPage } from "./helpers/browser";
import { serveStatic } from "./helpers/staticServer";
import { makeGitRepo, type GitRepo } from "../helpers/gitRepo";

const root = new URL("../..", import.meta.url).pathname;
// Builds go inside the project, as dist/ does (Astro lays out a build outside the project differently).
const scratch = join(root, "test-results", `revisions-${process.pid}`);
const demo = JSON.parse(readFileSync(join(root, "arms", "yarrowfield-sable-600.json"), "utf8")) as Record<string, any>;
let repo: GitRepo;

function armText(id: string, j1SpeedDegPerS: number, extra: Record<string, unknown> = {}): string {
  const arm = structuredClone(demo);
  delete arm.$schema; // the temporary folder has no public/schema beside it
  arm.id = id;
  arm.joints[0].maxSpeedDegPerS = j1SpeedDegPerS;
  return `${JSON.stringify({ ...arm, ...extra }, null, 2)}\n`;
}

/** Maximum tool speed by hand (see the module comment), m/s. */
function maxToolSpeedMPerS(j1SpeedDegPerS: number): number {
  const rad = Math.PI / 180;
  const plane = j1SpeedDegPerS * rad * (325 + 275) + 300 * rad * 275;
  return Math.hypot(plane, 1100) / 1000;
}

function build(name: string): { dist: string; output: string } {
  const dist = join(scratch, `dist-${name}`);
  const env = buildEnv({
    ARMDEX_ARMS_DIR: join(repo.root, "arms"),
    ARMDEX_OUT_DIR: dist,
    ARMDEX_CACHE_DIR: join(scratch, `cache-${name}`),
  });
  const r = spawnSync("npm", ["run", "build"], { cwd: root, env, encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
  const output = `${r.stdout}\n${r.stderr}`;
  expect(r.status, output.slice(-3000)).toBe(0);
  return { dist, output };
}

const page = (dist: string, path: string) => readFileSync(join(dist, path, "index.html"), "utf8");
const revDirs = (dist: string, id: string) => readdirSync(join(dist, "arms", id, "rev")).sort();
/** The revisions section of a sheet (failure messages stay short). */
function revisionsSection(html: string): string {
  const m = /<section id="revisions"[\s\S]*?<\/section>/.exec(html);
  if (!m) throw new Error("no revisions section");
  return m[0];
}
/** The value of a key figure on a page, e.g. "4.71 m/s" → 4.71. */
function keyFigure(html: string, key: string): number {
  const m = new RegExp(`data-key="${key}"[\\s\\S]*?<span class="key-value">([^<]+)</span>`).exec(html);
  if (!m) throw new Error(`no key figure ${key}`);
  return Number(m[1]!.replace(/[^\d.]/g, ""));
}

let first: { dist: string; output: string };
let second: { dist: string; output: string };
let revisions: { fingerprint: string; commit: string | null; date: string | null; changed: unknown[] }[];
const commits: string[] = [];

beforeAll(() => {
  mkdirSync(scratch, { recursive: true });
  repo = makeGitRepo(mkdtempSync(join(tmpdir(), "armdex-rev-e2e-")));
  repo.write("arms/sable-rev.json", armText("sable-rev", 300));
  // A second arm whose first commit no longer validates (a field the format does not know), fixed later.
  repo.write("arms/sable-bad.json", armText("sable-bad", 300, { reachM: 0.6 }));
  commits.push(repo.commit("add two arms", "2026-01-10T09:00:00+00:00"));
  repo.write("arms/sable-rev.json", armText("sable-rev", 250));
  repo.write("arms/sable-bad.json", armText("sable-bad", 300));
  commits.push(repo.commit("J1 speed from the new datasheet", "2026-02-10T09:00:00+00:00"));
  first = build("first");
  writeFileSync(join(repo.root, "arms", "sable-rev.json"), armText("sable-rev", 200));
  second = build("second");
  revisions = JSON.parse(readFileSync(join(second.dist, "data/arms/sable-rev/revisions.json"), "utf8"));
}, 600_000);

afterAll(() => {
  rmSync(scratch, { recursive: true, force: true });
  if (repo) rmSync(repo.root, { recursive: true, force: true });
});

describe("pinned revisions from a repository's history", () => {
  it("lists three revisions newest first, the working tree's first, with commits and dates", () => {
    expect(revisions.map((r) => [r.commit, r.date])).toEqual([
      [null, null],
      [commits[1], "2026-02-10T09:00:00+00:00"],
      [commits[0], "2026-01-10T09:00:00+00:00"],
    ]);
    expect(revDirs(second.dist, "sable-rev")).toEqual(revisions.map((r) => r.fingerprint).sort());
    expect(revDirs(first.dist, "sable-rev")).toEqual(
      revisions
        .slice(1)
        .map((r) => r.fingerprint)
        .sort(),
    );
  });

  it("names the changed field with old and new values, on the sheet and in revisions.json", () => {
    expect(revisions[0]!.changed).toEqual([{ path: "joints[0].maxSpeedDegPerS", from: 250, to: 200 }]);
    expect(revisions[1]!.changed).toEqual([{ path: "joints[0].maxSpeedDegPerS", from: 300, to: 250 }]);
    expect(revisions[2]!.changed).toEqual([]);
    const section = revisionsSection(page(second.dist, "arms/sable-rev"));
    expect(section).toContain("joints[0].maxSpeedDegPerS: 250 \u2192 200");
    expect(section).toContain("joints[0].maxSpeedDegPerS: 300 \u2192 250");
    // The key figure that moved, as the sheet shows it (two decimals, trailing zeros dropped).
    const shown = (j1: number) => `${String(Number(maxToolSpeedMPerS(j1).toFixed(2)))}\u00a0m/s`;
    expect(section).toContain(`Maximum tool speed: ${shown(250)} \u2192 ${shown(200)}`);
    expect(section).toContain(`Maximum tool speed: ${shown(300)} \u2192 ${shown(250)}`);
  });

  it("shows on each revision page the figures of its own J1 speed", () => {
    const speeds = [200, 250, 300];
    revisions.forEach((r, i) => {
      const html = page(second.dist, `arms/sable-rev/rev/${r.fingerprint}`);
      expect(keyFigure(html, "max-tool-speed"), r.fingerprint).toBeCloseTo(maxToolSpeedMPerS(speeds[i]!), 2);
      expect(html.includes(`Pinned revision ${r.fingerprint}`), `Pinned revision ${r.fingerprint}`).toBe(true);
      if (i > 0)
        expect(
          html.includes("A newer revision of this arm file exists"),
          "A newer revision of this arm file exists",
        ).toBe(true);
    });
    expect(
      page(second.dist, `arms/sable-rev/rev/${revisions[0]!.fingerprint}`).includes("not committed"),
      "not committed",
    ).toBe(true);
    // The current sheet shows the working tree's figures and cites its pinned address.
    const sheet = page(second.dist, "arms/sable-rev");
    expect(keyFigure(sheet, "max-tool-speed")).toBeCloseTo(maxToolSpeedMPerS(200), 2);
    expect(
      sheet.includes(`/arms/sable-rev/rev/${revisions[0]!.fingerprint}/`),
      `/arms/sable-rev/rev/${revisions[0]!.fingerprint}/`,
    ).toBe(true);
  });

  it("keeps the oldest revision's page byte-identical from one build to the next", () => {
    const oldest = `arms/sable-rev/rev/${revisions[2]!.fingerprint}/index.html`;
    expect(readFileSync(join(second.dist, oldest)).equals(readFileSync(join(first.dist, oldest)))).toBe(true);
  });

  it("gives a revision that no longer validates a page that says so, without failing the build", () => {
    const bad = JSON.parse(readFileSync(join(second.dist, "data/arms/sable-bad/revisions.json"), "utf8"));
    expect(bad).toHaveLength(2);
    const html = page(second.dist, `arms/sable-bad/rev/${bad[1].fingerprint}`);
    expect(html.includes("This revision no longer validates"), "This revision no longer validates").toBe(true);
    expect(/reachM: unknown field/.test(html), "the issue is listed").toBe(true);
    expect(second.output).toMatch(/1 no longer valid/);
  });

  it("copies the citation with the button, with no console error or CSP violation", async () => {
    const server = await serveStatic(second.dist, process.env.ARMDEX_BASE ?? "/");
    const browser = await launchChromium();
    try {
      const context = await browser.newContext();
      await context.grantPermissions(["clipboard-read", "clipboard-write"], { origin: server.origin });
      for (const path of ["arms/sable-rev/", `arms/sable-rev/rev/${revisions[2]!.fingerprint}/`]) {
        const tab = await context.newPage();
        const problems = await watchPage(tab, server.origin);
        await tab.goto(`${server.siteUrl}${path}`);
        const button = tab.locator("button.cite-copy");
        expect(await button.isVisible(), `${path}: copy button shown`).toBe(true);
        await button.click();
        await expect.poll(() => tab.textContent(".cite-status")).toMatch(/^(Copied\.|Selected: )/);
        const citation = ((await tab.textContent("#cite-text")) ?? "").trim();
        expect(citation).toMatch(/spec fingerprint [0-9a-f]{12} /);
        if ((await tab.textContent(".cite-status")) === "Copied.")
          expect(await tab.evaluate(() => navigator.clipboard.readText())).toBe(citation);
        expect(await collectProblems(tab, problems), path).toEqual([]);
        await tab.close();
      }
    } finally {
      await browser.close();
      await server.close();
    }
  }, 120_000);
});
