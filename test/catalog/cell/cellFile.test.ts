/**
 * The cell file format: the demo cells validate, the committed JSON Schema is the generated one and accepts the demo
 * cells while rejecting schema-level defects at their JSON paths (checked by an independent JSON Schema checker
 * written from the specification, test/helpers/jsonSchemaCheck.ts), and the loader's rules beyond the corpus.
 */
import { mkdtemp, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { cellJsonSchema, loadArms, loadCells, validateCell } from "../../../src/catalog";
import { resolveTargets } from "../../../src/core";
import { schemaErrors } from "../../helpers/jsonSchemaCheck";

const DEMO_ARMS = ["corvell-tern-12", "corvell-tern-25"];

/** A small valid cell of our own (invented numbers). */
function validCell(): Record<string, any> {
  return {
    id: "t",
    title: "Test cell",
    candidates: ["corvell-tern-12"],
    placement: { positionMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
    tool: { tcp: { xyzMm: [0, 0, 100], rpyDeg: [0, 0, 0] } },
    targets: [
      { name: "a", positionMm: [500, 0, 300], rpyDeg: [180, 0, 0] },
      { name: "b", relativeTo: "a", offsetMm: [0, 200, 0] },
    ],
    cycle: [
      { to: "a", motion: "joint" },
      { to: "b", motion: "linear", speedMmPerS: 300 },
    ],
  };
}

describe("validateCell", () => {
  it("accepts a minimal cell: parts and tool bodies default to none; the result is the file without $schema", () => {
    const r = validateCell({ ...validCell(), $schema: "x" }, "t.json", "t", DEMO_ARMS);
    expect(r.issues).toEqual([]);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.spec.parts).toEqual([]);
    expect(r.spec.tool.bodies).toEqual([]);
    expect("$schema" in r.spec).toBe(false);
    expect(resolveTargets(r.spec.targets)[1]!.positionMm).toEqual([500, 200, 300]);
  });

  it("a step may set one part down and grip another (release first, then grip)", () => {
    const cell = validCell();
    cell.parts = [
      { name: "raw", massKg: 1, cogMm: [0, 0, 150] },
      { name: "done", massKg: 1, cogMm: [0, 0, 150] },
    ];
    cell.cycle = [
      { to: "a", motion: "joint", grip: "raw" },
      { to: "b", motion: "linear", release: true, grip: "done" },
      { to: "a", motion: "joint", release: true },
    ];
    expect(validateCell(cell, "t.json", "t", DEMO_ARMS).issues).toEqual([]);
  });

  it("warns (no error) for a placement of an arm that is no candidate and for a target nothing uses", () => {
    const cell = validCell();
    cell.placements = { "corvell-tern-25": { positionMm: [0, 0, 300], rpyDeg: [0, 0, 0] } };
    cell.targets.push({ name: "spare", positionMm: [400, 0, 300], rpyDeg: [180, 0, 0] });
    const r = validateCell(cell, "t.json", "t", DEMO_ARMS);
    expect(r.ok).toBe(true);
    expect(r.issues.map((i) => [i.severity, i.path])).toEqual([
      ["warning", 'placements["corvell-tern-25"]'],
      ["warning", "targets[2].name"],
    ]);
  });

  it("reports every problem of one file at once", () => {
    const cell = validCell();
    cell.candidates = ["nope-arm"];
    cell.cycle[0].to = "zz";
    cell.cycle[1].release = true;
    cell.targets[1].offsetMm = [0, 0, "1"];
    const r = validateCell(cell, "t.json", "t", DEMO_ARMS);
    expect(r.ok).toBe(false);
    expect(r.issues.map((i) => i.path).sort()).toEqual(
      ["candidates[0]", "cycle[0].to", "cycle[1].release", "targets[1].offsetMm[2]"].sort(),
    );
  });
});

describe("cellJsonSchema", () => {
  it("is what public/schema/cell.schema.json holds: a freshness check (regenerate with `npx armdex schema`)", async () => {
    const committed = JSON.parse(await readFile("public/schema/cell.schema.json", "utf8"));
    expect(committed).toEqual(JSON.parse(JSON.stringify(cellJsonSchema())));
  });

  it("the committed schema accepts the demo cells and rejects schema-level defects at their JSON paths", async () => {
    const committed = JSON.parse(await readFile("public/schema/cell.schema.json", "utf8")) as Record<string, any>;
    for (const f of ["demo-press-tending.json", "demo-carton-palletizing.json"]) {
      const data = JSON.parse(await readFile(`arms/cells/${f}`, "utf8")) as unknown;
      expect(schemaErrors(committed, data), f).toEqual([]);
    }
    const rejected: [file: string, path: string][] = [
      ["negative-mass.json", "parts[0].massKg"],
      ["zero-mass-tool-body.json", "tool.bodies[0].massKg"],
      ["empty-cycle.json", "cycle"],
      ["speed-percent-too-high.json", "cycle[0].speedPercent"],
      ["negative-dwell.json", "cycle[1].dwellS"],
      ["unknown-field.json", "cycle[1].speedMmPerSec"],
      ["missing-tool.json", "tool"],
      // The motion rule (speedPercent on joint moves only) is in the schema as if/then/else: fails at the step.
      ["linear-with-speed-percent.json", "cycle[2]"],
      // Neither target form: anyOf fails at the target.
      ["target-both-forms.json", "targets[1]"],
    ];
    for (const [file, path] of rejected) {
      const data = JSON.parse(await readFile(`test/fixtures/bad-cells/${file}`, "utf8")) as unknown;
      expect(schemaErrors(committed, data), file).toContain(path);
    }
  });
});

describe("loadCells", () => {
  it("loads the demo cells against the demo catalog with no issue", async () => {
    const { arms } = await loadArms(["arms"]);
    const { cells, issues } = await loadCells(
      "arms/cells",
      arms.map((a) => a.id),
    );
    expect(issues).toEqual([]);
    expect(cells.map((c) => c.id)).toEqual(["demo-carton-palletizing", "demo-press-tending"]);
    for (const c of cells) {
      expect(c.spec.candidates.length).toBeGreaterThanOrEqual(5);
      expect(c.specHash).toMatch(/^[0-9a-f]{64}$/);
      // Every target resolves (no loop, no unknown base) and every step names one.
      const names = new Set(resolveTargets(c.spec.targets).map((t) => t.name));
      expect(c.spec.cycle.every((s) => names.has(s.to))).toBe(true);
    }
  });

  it("a missing cells folder holds no cells; a $schema path that points nowhere is an error", async () => {
    expect(await loadCells("test/fixtures/no-such-folder/cells", DEMO_ARMS)).toEqual({ cells: [], issues: [] });
    const dir = await mkdtemp(join(tmpdir(), "armdex-cell-"));
    try {
      await writeFile(join(dir, "t.json"), JSON.stringify({ ...validCell(), $schema: "../nowhere/cell.schema.json" }));
      const r = await loadCells(dir, DEMO_ARMS);
      expect(r.cells).toEqual([]);
      expect(r.issues.map((i) => [i.path, i.message.slice(0, 45)])).toEqual([
        ["$schema", "expected a path to the cell JSON Schema (e.g."],
      ]);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});
