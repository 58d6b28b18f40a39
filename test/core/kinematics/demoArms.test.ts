/**
 * Every arm in arms/ (loaded the way the site and CLI load them, through loadArms of src/catalog): the Jacobian of
 * the flange matches central finite differences of forward kinematics at 5 reproducible random poses within the
 * driven-joint limits (CHECKS C11; issue 2 §2 "Jacobian columns against central finite differences of FK for
 * random poses of every demo arm"). No arm is skipped: an invalid file or an empty folder fails the suite.
 */
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { loadArms } from "../../../src/catalog/index";
import { createScratch, forwardInto, jacobianInto } from "../../../src/core";
import { expectClose } from "../../helpers/expectClose";
import { finiteDifferenceJacobian } from "../../helpers/finiteDifference";
import { mulberry32, uniform } from "../../helpers/prng";

// The catalog folder, or ARMDEX_ARMS_DIR as getCatalog reads it.
const ARMS_DIR = process.env.ARMDEX_ARMS_DIR ?? fileURLToPath(new URL("../../../arms", import.meta.url));
const { arms, issues } = await loadArms([ARMS_DIR]);

describe("loadArms(arms/)", () => {
  it("loads at least one arm and reports no errors (no arm is dropped silently)", () => {
    const errors = issues.filter((i) => i.severity === "error").map((i) => `${i.file} ${i.path}: ${i.message}`);
    expect(errors).toEqual([]);
    expect(arms.length).toBeGreaterThanOrEqual(1);
  });
});

describe("jacobianInto on every demo arm", () => {
  it.each(arms.map((arm) => [arm.id, arm] as const))(
    "jacobianInto(%s) matches finite differences at 5 random poses",
    (id, arm) => {
      // CHECKS C11: h = 1e-6, tolerance 1e-7 abs at metre scale, scaled by the arm's size (characteristicLengthM,
      // at least 1 m) since the round-off term grows with it. Poses uniform within the driven limits; where a limit
      // is open, ±π rad (revolute) or ±1 m (prismatic). The PRNG (mulberry32) starts from a hash of the arm id, so failures reproduce.
      const chain = arm.chain;
      const m = chain.drivenCount;
      const s = createScratch(chain);
      const pose = (q: Float64Array) => forwardInto(chain, q, s);
      let start = 0;
      for (const ch of id) start = (Math.imul(start, 31) + ch.charCodeAt(0)) >>> 0;
      const rand = mulberry32(start);
      const tol = 1e-7 * Math.max(1, chain.characteristicLengthM);
      for (let trial = 0; trial < 5; trial++) {
        const q = Array.from({ length: m }, (_, c) => {
          const open = chain.isPrismatic[chain.drivenJoint[c]!] ? 1 : Math.PI;
          const lo = Number.isFinite(chain.lowerSi[c]!) ? chain.lowerSi[c]! : -open;
          const hi = Number.isFinite(chain.upperSi[c]!) ? chain.upperSi[c]! : open;
          return uniform(rand, lo, hi);
        });
        const f = forwardInto(chain, q, s);
        const j = jacobianInto(new Float64Array(6 * m), chain, s, f[3]!, f[7]!, f[11]!);
        expectClose(
          j,
          finiteDifferenceJacobian(pose, q, 1e-6),
          tol,
          `${arm.file}, trial ${trial}, q = ${q.map((v) => v.toFixed(4))}`,
        );
      }
    },
  );
});
