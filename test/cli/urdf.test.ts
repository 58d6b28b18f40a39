/**
 * Tests of the `armdex import urdf` and `armdex export urdf` commands (src/cli/urdf.ts) on the invented URDF
 * test/reference/urdf/handmade-7j.urdf and a demo arm. The computed poses are checked against Orocos KDL in
 * test/catalog/urdf/; here: what is printed where, and the exit codes (messages as the validator words them).
 */
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { armFileJson, exportUrdfCommand, importUrdfCommand } from "../../src/cli/urdf";

const FILE = fileURLToPath(new URL("../reference/urdf/handmade-7j.urdf", import.meta.url));
const usage = (m: string) => new Error(`usage: ${m}`);

describe("import urdf command", () => {
  it("without a merge file prints the arm and lists what is missing in the check's own words", async () => {
    const out = await importUrdfCommand([FILE, "--root", "world", "--tip", "tool0", "--id", "handmade-7j"], usage);
    expect(out.code).toBe(1);
    expect(JSON.parse(out.stdout).convention).toBe("frames");
    expect(out.stderr).toContain("error: arms/handmade-7j.json: maker: missing required field: expected string");
    expect(out.stderr).toContain("source.document: missing required field");
    expect(out.stderr).toContain("give them in a --merge file");
  });

  it("asks for the missing options", async () => {
    await expect(importUrdfCommand([FILE, "--root", "world"], usage)).rejects.toThrow("--tip");
    await expect(importUrdfCommand([], usage)).rejects.toThrow("exactly one URDF file");
  });

  it("reports a URDF problem as one error line per problem, naming the file", async () => {
    const out = await importUrdfCommand([FILE, "--root", "world", "--tip", "nowhere", "--id", "x"], usage);
    expect(out.code).toBe(1);
    expect(out.stdout).toBe("");
    expect(out.stderr).toMatch(/^error: .*handmade-7j\.urdf: --tip: no link named "nowhere"/);
  });
});

describe("export urdf command", () => {
  it("prints the URDF of a demo arm", async () => {
    const arm = fileURLToPath(new URL("../../arms/quenby-span-g3.json", import.meta.url));
    const out = await exportUrdfCommand([arm], usage);
    expect(out.code).toBe(0);
    expect(out.stdout).toMatch(/^<\?xml version="1\.0"\?>/);
    // Z: the prismatic stroke 0–1000 mm, 1000 mm/s, 1400 N as lower/upper m, m/s and effort N.
    expect(out.stdout).toContain('<limit lower="0" upper="1" velocity="1" effort="1400"/>');
    expect(out.stdout).toContain('<link name="flange"/>');
  });

  it("reports an invalid arm file as the check does", async () => {
    const out = await exportUrdfCommand(["/nonexistent/arm.json"], usage);
    expect(out.code).toBe(1);
    expect(out.stderr).toContain("cannot read the file");
    await expect(exportUrdfCommand([], usage)).rejects.toThrow("exactly one arm file");
  });
});

describe("armFileJson", () => {
  it("lays out JSON as the arm files do and reads back as the same value (JSON.parse)", () => {
    const value = {
      id: "x",
      origin: { xyzMm: [0, -1150.5, 1e-7], rpyDeg: [0, 0, -90] },
      coupling: { terms: [{ joint: "J2", gain: -1 }] },
      text: 'quote " and \\ backslash',
      list: [],
      none: null,
    };
    const text = armFileJson(value);
    expect(JSON.parse(text)).toEqual(value);
    expect(text).toContain('"origin": { "xyzMm": [0, -1150.5, 1e-7], "rpyDeg": [0, 0, -90] }');
  });
});
