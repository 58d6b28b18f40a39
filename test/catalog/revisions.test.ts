/**
 * Reading an arm folder's history with git (src/catalog/history.ts) and turning it into revisions
 * (src/catalog/revisions.ts), on throwaway repositories in a temporary folder: committed versions newest first,
 * layout-only commits folded into one revision, the working tree's change as a revision of its own, a version that
 * no longer validates kept and marked, and every way history can be unavailable. The expected revisions are
 * written out from the commits each test makes. Invented arm.
 */
import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { loadArms, specHashOf } from "../../src/catalog";
import { parseBatch, parseLog, readFolderHistory } from "../../src/catalog/history";
import { collectRevisions, readRevisionData } from "../../src/catalog/revisions";
import { gitEnv, makeGitRepo } from "../helpers/gitRepo";

function armJson(speedJ2: number, extra: Record<string, unknown> = {}): Record<string, unknown> {
  const joint = (name: string, aMm: number, alphaDeg: number, dMm: number, speed = 200) => ({
    name,
    kind: "revolute",
    dh: { aMm, alphaDeg, dMm, thetaDeg: 0 },
    rangeDeg: [-170, 170],
    maxSpeedDegPerS: speed,
  });
  return {
    id: "rev-arm",
    maker: "Test Maker",
    model: "R-1",
    class: "articulated",
    mountings: ["floor"],
    massKg: 50,
    ratedPayloadKg: 5,
    repeatabilityMm: 0.03,
    protection: "IP54",
    convention: "dh",
    joints: [joint("J1", 100, -90, 400), joint("J2", 500, 0, 0, speedJ2), joint("J3", 0, 0, 80)],
    flange: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
    source: { document: "Test sheet", revision: "A", date: "2026-01-01" },
    ...extra,
  };
}

const text = (v: unknown, indent = 2) => `${JSON.stringify(v, null, indent)}\n`;
const scratch: string[] = [];
afterAll(() => {
  for (const d of scratch) rmSync(d, { recursive: true, force: true });
});
function repo() {
  const r = makeGitRepo();
  scratch.push(r.root);
  return r;
}

describe("parseLog and parseBatch", () => {
  it("reads git's output formats", () => {
    const h1 = "a".repeat(40),
      h2 = "b".repeat(40);
    expect(
      parseLog(
        `\u0001${h1} 2026-01-02T10:00:00+01:00\n\nx.json\nsub/y.json\n\u0001${h2} 2026-01-01T09:00:00Z\n\ny.json\n`,
      ),
    ).toEqual([
      { commit: h1, date: "2026-01-02T10:00:00+01:00", names: ["x.json"] },
      { commit: h2, date: "2026-01-01T09:00:00Z", names: ["y.json"] },
    ]);
    const out = Buffer.from(`${h1} blob 3\nabc\n${h2}:./gone.json missing\n${h2} blob 0\n\n`);
    expect(parseBatch(out, 3).map((b) => (b === null ? null : b.toString()))).toEqual(["abc", null, ""]);
  });
});

describe("readFolderHistory", () => {
  it("gives each file's committed versions newest first, and none for a file never committed", async () => {
    const r = repo();
    r.write("arms/rev-arm.json", text(armJson(190)));
    r.write("arms/sub/other.json", "{}");
    const c1 = r.commit("first", "2026-02-01T10:00:00+00:00");
    r.write("arms/rev-arm.json", text(armJson(180)));
    const c2 = r.commit("second", "2026-03-01T10:00:00+00:00");
    r.write("arms/new-arm.json", text(armJson(170, { id: "new-arm" })));
    const h = await readFolderHistory(join(r.root, "arms"), ["rev-arm.json", "new-arm.json"]);
    expect(h.status).toBe("ok");
    if (h.status !== "ok") return;
    const v = h.versions.get("rev-arm.json")!;
    expect(v.map((x) => [x.commit, x.date])).toEqual([
      [c2, "2026-03-01T10:00:00+00:00"],
      [c1, "2026-02-01T10:00:00+00:00"],
    ]);
    expect(JSON.parse(v[1]!.bytes.toString())).toEqual(armJson(190));
    expect(h.versions.has("new-arm.json")).toBe(false);
  });

  it("says why history is unavailable: not a repository, a shallow clone, no git, turned off", async () => {
    const plain = mkdtempSync(join(tmpdir(), "armdex-nogit-"));
    scratch.push(plain);
    expect(await readFolderHistory(plain, ["x.json"])).toEqual({ status: "unavailable", reason: "not-a-repository" });

    const r = repo();
    r.write("arms/rev-arm.json", text(armJson(190)));
    r.commit("first", "2026-02-01T10:00:00+00:00");
    r.write("arms/rev-arm.json", text(armJson(180)));
    r.commit("second", "2026-03-01T10:00:00+00:00");
    const shallow = mkdtempSync(join(tmpdir(), "armdex-shallow-"));
    scratch.push(shallow);
    execFileSync("git", ["clone", "-q", "--depth", "1", `file://${r.root}`, shallow], { env: gitEnv() });
    expect(await readFolderHistory(join(shallow, "arms"), ["rev-arm.json"])).toEqual({
      status: "unavailable",
      reason: "shallow-clone",
    });

    // No git on the machine: the command cannot be started.
    const path = process.env.PATH;
    process.env.PATH = join(plain, "no-bin-here");
    try {
      expect(await readFolderHistory(join(r.root, "arms"), ["rev-arm.json"])).toEqual({
        status: "unavailable",
        reason: "no-git",
      });
    } finally {
      process.env.PATH = path;
    }

    const before = process.env.ARMDEX_REVISIONS;
    process.env.ARMDEX_REVISIONS = "off";
    try {
      expect(await readFolderHistory(join(r.root, "arms"), ["rev-arm.json"])).toEqual({
        status: "unavailable",
        reason: "disabled",
      });
    } finally {
      if (before === undefined) delete process.env.ARMDEX_REVISIONS;
      else process.env.ARMDEX_REVISIONS = before;
    }
  });
});

describe("collectRevisions", () => {
  it("folds layout-only commits, adds the working tree's change, and keeps a version that no longer validates", async () => {
    const r = repo();
    const dir = join(r.root, "arms");
    r.write("arms/rev-arm.json", text(armJson(190)));
    const c1 = r.commit("first", "2026-02-01T10:00:00+00:00");
    r.write("arms/rev-arm.json", text(armJson(190), 4)); // same content, other layout
    r.commit("reindent", "2026-02-15T10:00:00+00:00");
    r.write("arms/rev-arm.json", text({ ...armJson(180), reachM: 1.2 })); // a field the format does not know
    const c3 = r.commit("bad", "2026-03-01T10:00:00+00:00");
    r.write("arms/rev-arm.json", text(armJson(180)));
    const c4 = r.commit("fixed", "2026-04-01T10:00:00+00:00");
    writeFileSync(join(dir, "rev-arm.json"), text(armJson(175)));

    const { arms } = await loadArms([dir]);
    const [collected] = await collectRevisions(arms);
    const data = collected!.data;
    expect(data.history).toBe("available");
    const hashes = [armJson(175), armJson(180), { ...armJson(180), reachM: 1.2 }, armJson(190)].map(specHashOf);
    expect(data.revisions.map((x) => [x.specHash, x.commit, x.valid])).toEqual([
      [hashes[0], null, true],
      [hashes[1], c4, true],
      [hashes[2], c3, false],
      [hashes[3], c1, true],
    ]);
    expect(data.revisions.map((x) => x.fingerprint)).toEqual(hashes.map((h) => h.slice(0, 12)));
    expect(data.revisions[0]!.changed).toEqual([{ path: "joints[1].maxSpeedDegPerS", from: 180, to: 175 }]);
    expect(data.revisions[1]!.changed).toEqual([{ path: "reachM", from: 1.2, to: null }]);
    expect(data.revisions[3]!.changed).toEqual([]);
    expect(data.revisions[2]!.issues.join("\n")).toMatch(/@[0-9a-f]{12}: reachM: unknown field/);
    expect(data.revisions[0]!.source).toEqual({ document: "Test sheet", revision: "A", date: "2026-01-01" });
    // Three valid revisions to analyse: the current arm and two earlier ones.
    expect([...collected!.arms.keys()].sort()).toEqual([hashes[0], hashes[1], hashes[3]].sort());
    expect(collected!.arms.get(hashes[0]!)).toBe(arms[0]);
  });

  it("names a never-committed file, and a folder outside any repository, with the current version alone", async () => {
    const r = repo();
    r.write("arms/other.json", "{}\n");
    r.commit("other", "2026-02-01T10:00:00+00:00");
    r.write("arms/rev-arm.json", text(armJson(190)));
    const { arms } = await loadArms([join(r.root, "arms", "rev-arm.json")]);
    const [c] = await collectRevisions(arms);
    expect(c!.data.history).toBe("never-committed");
    expect(c!.data.revisions.map((x) => [x.commit, x.specHash])).toEqual([[null, arms[0]!.specHash]]);

    const plain = mkdtempSync(join(tmpdir(), "armdex-nogit-"));
    scratch.push(plain);
    writeFileSync(join(plain, "rev-arm.json"), text(armJson(190)));
    const loose = await loadArms([plain]);
    const [d] = await collectRevisions(loose.arms);
    expect(d!.data.history).toBe("not-a-repository");
    expect(d!.data.revisions).toHaveLength(1);
  });

  it("reads back 'not prepared' when no revision data was written for this version of the file", async () => {
    const cache = mkdtempSync(join(tmpdir(), "armdex-cache-"));
    scratch.push(cache);
    const before = process.env.ARMDEX_CACHE_DIR;
    process.env.ARMDEX_CACHE_DIR = cache;
    try {
      const plain = mkdtempSync(join(tmpdir(), "armdex-nogit-"));
      scratch.push(plain);
      writeFileSync(join(plain, "rev-arm.json"), text(armJson(190)));
      const { arms } = await loadArms([plain]);
      const d = await readRevisionData(arms[0]!);
      expect(d.history).toBe("not-prepared");
      expect(d.revisions.map((x) => x.specHash)).toEqual([arms[0]!.specHash]);
    } finally {
      if (before === undefined) delete process.env.ARMDEX_CACHE_DIR;
      else process.env.ARMDEX_CACHE_DIR = before;
    }
  });
});
