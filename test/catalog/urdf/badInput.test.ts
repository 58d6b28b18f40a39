/**
 * Bad URDF input (src/catalog/urdf/read.ts and import.ts): each problem gives one clear error that names the element
 * and says what to change. The expected rules come from the URDF definition (ROS wiki "urdf/XML/joint": joint types
 * revolute, continuous, prismatic, fixed, floating, planar; lengths in m, angles in rad; limit lower/upper default 0;
 * mimic value = multiplier·master + offset) and from XML well-formedness; no message is copied from our output.
 */
import { describe, expect, it } from "vitest";
import { importUrdf, readUrdf, UrdfError, URDF_MAX_ORIGIN_M } from "../../../src/catalog/urdf";

/** A two-joint URDF with optional replacements: base → l1 (J1) → l2 (J2) → tool (fixed). */
function urdf(opts: { j1?: string; j2?: string; extra?: string; head?: string } = {}): string {
  const j1 =
    opts.j1 ??
    `<joint name="J1" type="revolute"><parent link="base"/><child link="l1"/><origin xyz="0 0 0.4" rpy="0 0 0"/>
       <axis xyz="0 0 1"/><limit lower="-3" upper="3" velocity="2" effort="100"/></joint>`;
  const j2 =
    opts.j2 ??
    `<joint name="J2" type="revolute"><parent link="l1"/><child link="l2"/><origin xyz="0.5 0 0" rpy="0 0 0"/>
       <axis xyz="0 1 0"/><limit lower="-2" upper="2" velocity="2" effort="80"/></joint>`;
  return `<?xml version="1.0"?>
<robot name="t"${opts.head ?? ""}>
  <link name="base"/><link name="l1"/><link name="l2"/><link name="tool"/><link name="other"/>
  ${j1}
  ${j2}
  <joint name="T" type="fixed"><parent link="l2"/><child link="tool"/><origin xyz="0 0 0.1"/></joint>
  ${opts.extra ?? ""}
</robot>`;
}
const CHAIN = { root: "base", tip: "tool", id: "t" };

function errorOf(f: () => unknown): string {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(UrdfError);
    return (e as Error).message;
  }
  throw new Error("expected a UrdfError, nothing was thrown");
}

describe("URDF bad input: a clear error each", () => {
  it("the good file imports (the baseline the cases below break)", () => {
    const arm = importUrdf(urdf(), CHAIN) as { joints: unknown[] };
    expect(arm.joints).toHaveLength(2);
  });

  it("malformed XML: line and column", () => {
    const m = errorOf(() => readUrdf(urdf().replace("</robot>", "")));
    expect(m).toMatch(/^malformed XML at line \d+, column \d+: /);
    expect(errorOf(() => readUrdf("<robot><link name='a'></robot>"))).toContain("malformed XML at line 1");
    expect(errorOf(() => readUrdf(""))).toContain("the file is empty");
  });

  it("not a URDF document: no <robot> root", () => {
    expect(errorOf(() => readUrdf("<model><link name='a'/></model>"))).toContain(
      "expected a <robot> root element, found <model>",
    );
  });

  it("Xacro: the namespace, xacro: elements or ${…} expressions say that Xacro is not URDF", () => {
    const ns = errorOf(() => readUrdf(urdf({ head: ' xmlns:xacro="http://www.ros.org/wiki/xacro"' })));
    expect(ns).toContain("Xacro is not URDF");
    expect(ns).toContain("expand its macros into plain URDF first");
    const el = errorOf(() => readUrdf(urdf({ extra: '<xacro:property name="l" value="0.4"/>' })));
    expect(el).toContain("Xacro is not URDF");
    const expr = errorOf(() => readUrdf(urdf().replace('xyz="0 0 0.4"', 'xyz="0 0 ${l}"')));
    expect(expr).toContain("Xacro is not URDF");
  });

  it("missing links: a joint naming an undeclared link, and --root/--tip that are no link", () => {
    const m = errorOf(() => readUrdf(urdf().replace('<link name="l2"/>', "")));
    expect(m).toBe(
      `joint "J2" names child link "l2", which the file does not declare: add <link name="l2"/> or fix the name`,
    );
    expect(errorOf(() => importUrdf(urdf(), { ...CHAIN, tip: "tool0" }))).toContain(
      `--tip: no link named "tool0" in the file; its links are "base", "l1", "l2", "tool", "other"`,
    );
    expect(errorOf(() => importUrdf(urdf(), { ...CHAIN, root: "bse" }))).toContain(`--root: no link named "bse"`);
  });

  it("root and tip not on one chain", () => {
    const extra = `<joint name="O" type="fixed"><parent link="base"/><child link="other"/></joint>`;
    const m = errorOf(() => importUrdf(urdf({ extra }), { ...CHAIN, root: "other" }));
    expect(m).toContain(`root "other" and tip "tool" are not on one chain`);
    expect(m).toContain(`"tool" ← "l2" ← "l1" ← "base"`);
  });

  it("unsupported joint types: an unknown type, planar and floating", () => {
    expect(errorOf(() => readUrdf(urdf().replace('name="J2" type="revolute"', 'name="J2" type="ball"')))).toContain(
      `joint "J2": unsupported joint type "ball": URDF joints are revolute, continuous, prismatic, fixed, floating, planar`,
    );
    for (const type of ["planar", "floating"]) {
      const m = errorOf(() =>
        importUrdf(urdf().replace('name="J2" type="revolute"', `name="J2" type="${type}"`), CHAIN),
      );
      expect(m).toContain(`joint "J2" is ${type}`);
      expect(m).toContain("choose --root and --tip so the chain avoids it");
    }
  });

  it("continuous joints and missing limits name the joint and what to put where", () => {
    const cont = errorOf(() =>
      importUrdf(urdf().replace('name="J1" type="revolute"', 'name="J1" type="continuous"'), CHAIN),
    );
    expect(cont).toContain(`joint "J1" is continuous`);
    expect(cont).toContain(`the merge file (joints."J1".rangeDeg)`);
    // With the range from the merge file, the same file imports.
    const merged = importUrdf(urdf().replace('name="J1" type="revolute"', 'name="J1" type="continuous"'), {
      ...CHAIN,
      merge: { joints: { J1: { rangeDeg: [-360, 360] } } },
    }) as { joints: { rangeDeg?: number[] }[] };
    expect(merged.joints[0]!.rangeDeg).toEqual([-360, 360]);
    // No <limit> at all: both the range and the speed are asked for, in one error listing both.
    const none = errorOf(() =>
      importUrdf(urdf().replace('<limit lower="-2" upper="2" velocity="2" effort="80"/>', ""), CHAIN),
    );
    expect(none).toContain(`joint "J2" has no position limits`);
    expect(none).toContain(`joint "J2" has no velocity limit`);
    expect(none).toContain(`joints."J2".maxSpeedDegPerS`);
    // lower = upper = 0 (the URDF defaults): no range.
    expect(errorOf(() => importUrdf(urdf().replace('lower="-2" upper="2"', 'lower="0" upper="0"'), CHAIN))).toContain(
      `joint "J2" has no position limits`,
    );
  });

  it(`units off by 1000: a link 0.8 km long (over ${URDF_MAX_ORIGIN_M} m) is millimetres written as metres`, () => {
    const m = errorOf(() => importUrdf(urdf().replace('xyz="0.5 0 0"', 'xyz="800 0 0"'), CHAIN));
    expect(m).toContain(`joint "J2": origin xyz="800 0 0" puts it 800.0 m from its parent link`);
    expect(m).toContain("look like millimetres (divide by 1000)");
    const deg = errorOf(() => importUrdf(urdf().replace('lower="-2" upper="2"', 'lower="-170" upper="170"'), CHAIN));
    expect(deg).toContain("look like degrees");
    const rpy = errorOf(() =>
      importUrdf(urdf().replace('xyz="0.5 0 0" rpy="0 0 0"', 'xyz="0.5 0 0" rpy="0 90 0"'), CHAIN),
    );
    expect(rpy).toContain("look like degrees");
  });

  it("numbers where numbers belong", () => {
    expect(errorOf(() => readUrdf(urdf().replace('xyz="0.5 0 0"', 'xyz="0.5 0"')))).toBe(
      `joint "J2" origin xyz: expected 3 numbers separated by spaces, found "0.5 0"`,
    );
    expect(errorOf(() => readUrdf(urdf().replace('velocity="2" effort="80"', 'velocity="fast" effort="80"')))).toBe(
      `joint "J2" limit velocity: expected a number, found "fast"`,
    );
  });

  it("mimic of a joint that is not earlier on the chain", () => {
    const j1 = `<joint name="J1" type="revolute"><parent link="base"/><child link="l1"/><axis xyz="0 0 1"/>
      <limit lower="-3" upper="3" velocity="2"/><mimic joint="J2"/></joint>`;
    expect(errorOf(() => importUrdf(urdf({ j1 }), CHAIN))).toContain(`joint "J1" mimics "J2", which is a later joint`);
  });

  it("merge file: unknown fields and joints are named", () => {
    expect(errorOf(() => importUrdf(urdf(), { ...CHAIN, merge: { payloadKg: 5 } as never }))).toContain(
      `merge file: unknown field "payloadKg"`,
    );
    expect(errorOf(() => importUrdf(urdf(), { ...CHAIN, merge: { joints: { J9: {} } } }))).toContain(
      `merge file: joints."J9" is not a movable joint of the chain; its joints are "J1", "J2"`,
    );
    expect(
      errorOf(() => importUrdf(urdf(), { ...CHAIN, merge: { joints: { J1: { effortNm: 3 } as never } } })),
    ).toContain(`joints."J1": unknown field "effortNm"`);
  });

  it("a link with two parent joints is not a tree", () => {
    const extra = `<joint name="X" type="fixed"><parent link="other"/><child link="l2"/></joint>`;
    expect(errorOf(() => readUrdf(urdf({ extra })))).toContain(`link "l2" is the child of two joints ("J2" and "X")`);
  });
});
