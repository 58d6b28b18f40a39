/**
 * forwardInto / poseReport of the generic 6R against a committed Orocos KDL fixture (CHECKS C10).
 * The fixture test/reference/kdl-fixture.json was written by test/reference/make_kdl_fixture.py with Debian's
 * python3-pykdl (the versions are recorded inside it); CI does not regenerate it. KDL's Frame.DH is
 * Rz(θ)·Tz(d)·Tx(a)·Rx(α) and ChainJntToJacSolver's rows are (v; ω) at the tip in the base frame, the same layout
 * as jacobianInto (CHECKS §0 [lib✓]).
 */
import { readFileSync } from "node:fs";
import { determinant, Matrix } from "ml-matrix";
import { describe, expect, it } from "vitest";
import { compileChain, poseReport } from "../../../src/core";
import { expectClose, expectRelClose } from "../../helpers/expectClose";
import { GENERIC_6R_SI, generic6rDh } from "../../helpers/testArms";

interface KdlCase {
  readonly qRad: number[];
  readonly baseFromFlange: number[];
  readonly jacobian: number[];
  readonly detJacobian: number;
}
interface KdlFixture {
  readonly versions: Record<string, string | null>;
  readonly dh: { a: number; alpha: number; d: number; theta: number }[];
  readonly cases: KdlCase[];
}

const fixture = JSON.parse(
  readFileSync(new URL("../../reference/kdl-fixture.json", import.meta.url), "utf8"),
) as KdlFixture;

describe("poseReport(generic 6R) against Orocos KDL 1.5.1", () => {
  it("the fixture describes the same arm and records the library version", () => {
    expect(fixture.versions["PyKDL"]).toBeTruthy();
    expect(fixture.cases.length).toBe(4);
    expectClose(
      fixture.dh.flatMap((r) => [r.a, r.alpha, r.d, r.theta]),
      GENERIC_6R_SI.rows.flatMap((r) => [r.a, r.alpha, r.d, r.theta]),
      1e-15,
      "DH table",
    );
  });

  it.each(fixture.cases.map((c, i) => [i, c] as const))(
    "case %i: flange pose, Jacobian and det J match KDL",
    (_, c) => {
      // Orocos KDL ChainFkSolverPos_recursive and ChainJntToJacSolver (CHECKS C10, §5); KDL matched an independent
      // implementation to 2e-16 in CHECKS, so 1e-12 (m, rad) leaves room only for round-off. det J: 1e-9 relative
      // (CHECKS C4), computed here by ml-matrix.
      const r = poseReport(compileChain(generic6rDh()), c.qRad);
      expectClose(r.baseFromFlange, c.baseFromFlange, 1e-12, "baseFromFlange");
      expectClose(r.jacobian, c.jacobian, 1e-12, "jacobian");
      expectRelClose(determinant(Matrix.from1DArray(6, 6, Array.from(r.jacobian))), c.detJacobian, 1e-9, "det J", 1e-9);
    },
  );
});
