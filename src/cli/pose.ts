/** `armdex pose`: one pose of one arm as JSON (file units outside, SI Jacobian as the contract says). Pure. */
import type { Arm } from "../catalog";
import { degToRad, mmToM, mToMm, poseReport, radToDeg, rpyOfInto } from "../core";
import { createSpeedScratch, guaranteedLineSpeed, maxToolSpeed } from "../core";
import { SINGULAR_INVERSE_CONDITION, singularityReport } from "../core";

/** The options of `armdex pose` (node:util parseArgs form). */
export const POSE_OPTIONS = {
  joints: { type: "string" },
  tool: { type: "string" },
  "allow-outside": { type: "boolean" },
} as const;

export type CommandResult<T> = { ok: true; value: T } | { ok: false; message: string; usage?: boolean };

export function parseNumberList(text: string, label: string, count?: number): number[] | string {
  const parts = text.split(",").map((s) => s.trim());
  const values = parts.map(Number);
  const bad = parts.findIndex((p, i) => p === "" || !Number.isFinite(values[i]!));
  if (bad >= 0)
    return `${label}: expected numbers separated by commas, found ${JSON.stringify(parts[bad])} at position ${bad + 1}`;
  if (count !== undefined && values.length !== count)
    return `${label}: expected ${count} values, found ${values.length}`;
  return values;
}

/** Rounds to a multiple of `step` (removes float noise such as 1e-13 mm without losing meaningful digits). */
const round = (x: number, step = 1e-9) =>
  Number.isFinite(x) ? Number(x.toFixed(Math.round(-Math.log10(step)))) + 0 : x;
const roundSig = (x: number) => (Number.isFinite(x) ? Number(x.toPrecision(12)) : x);

export function poseCommand(
  arm: Arm,
  jointsText: string,
  toolText: string | undefined,
  allowOutside: boolean,
): CommandResult<Record<string, unknown>> {
  const chain = arm.chain;
  const m = chain.drivenCount;
  const driven = Array.from(chain.drivenJoint, (k) => arm.spec.joints[k]!);
  const q = parseNumberList(jointsText, "--joints", m);
  if (typeof q === "string")
    return {
      ok: false,
      usage: true,
      message: `${q} (driven joints of ${arm.id}: ${driven.map((j) => j.name).join(", ")})`,
    };
  let toolMm = [0, 0, 0];
  if (toolText !== undefined) {
    const t = parseNumberList(toolText, "--tool", 3);
    if (typeof t === "string") return { ok: false, usage: true, message: t };
    toolMm = t;
  }
  const outside: string[] = [];
  const qSi = q.map((v, i) => {
    const j = driven[i]!;
    const prismatic = j.kind === "prismatic";
    const range = prismatic ? j.rangeMm : j.rangeDeg;
    if (range && (v < range[0] || v > range[1]))
      outside.push(`${j.name} = ${v} ${prismatic ? "mm" : "deg"} is outside [${range[0]}, ${range[1]}]`);
    return prismatic ? mmToM(v) : degToRad(v);
  });
  if (outside.length && !allowOutside)
    return { ok: false, message: `${outside.join("; ")} (use --allow-outside to compute anyway)` };
  const r = poseReport(chain, qSi, toolMm.map(mmToM));
  const t = r.baseFromFlange;
  const rpy = rpyOfInto([0, 0, 0], t) as number[];
  const jointFrames = chain.jointNames.map((name, i) => {
    const f = r.linkFrames.subarray(16 * i, 16 * i + 16);
    return {
      name,
      positionMm: [f[3]!, f[7]!, f[11]!].map((v) => round(mToMm(v))),
      rotation: [0, 1, 2].map((row) => [0, 1, 2].map((c) => round(f[row * 4 + c]!, 1e-12))),
    };
  });
  const hasTool = toolMm.some((v) => v !== 0);
  const sing = singularityReport(
    chain,
    r.jacobian,
    SINGULAR_INVERSE_CONDITION,
    r.wcpM ? Array.from(r.wcpM, (v, i) => v - r.tcpM[i]!) : undefined,
  );
  return {
    ok: true,
    value: {
      arm: arm.id,
      specHash: arm.specHash,
      joints: driven.map((j, i) => ({ name: j.name, value: q[i], unit: j.kind === "prismatic" ? "mm" : "deg" })),
      outsideRange: outside,
      flange: {
        positionMm: [t[3]!, t[7]!, t[11]!].map((v) => round(mToMm(v))),
        rotation: [0, 1, 2].map((row) => [0, 1, 2].map((c) => round(t[row * 4 + c]!, 1e-12))),
        rpyDeg: rpy.map((v) => round(radToDeg(v))),
      },
      ...(hasTool ? { tool: { offsetMm: toolMm, positionMm: Array.from(r.tcpM, (v) => round(mToMm(v))) } } : {}),
      ...(r.wcpM ? { wcp: { positionMm: Array.from(r.wcpM, (v) => round(mToMm(v))) } } : {}),
      jacobian: [0, 1, 2, 3, 4, 5].map((row) =>
        Array.from(r.jacobian.subarray(row * m, row * m + m), (v) => round(v, 1e-12)),
      ),
      jacobianNote:
        `6×${m} geometric Jacobian of the ${hasTool ? "tool point" : "flange origin"} in the base frame; rows vx, vy, vz, ωx, ωy, ωz; ` +
        "SI: linear rows in m/s per rad/s (revolute) or per m/s (prismatic), angular rows in rad/s per rad/s.",
      singularValues: Array.from(r.singularValues, (v) => roundSig(v)),
      manipulability: roundSig(r.manipulability),
      manipulabilityNote:
        m >= 6
          ? "Yoshikawa: sqrt(det(J·Jᵀ)) of the SI Jacobian"
          : `product of the ${m} singular values, sqrt(det(Jᵀ·J)), since the arm has fewer than 6 driven joints`,
      conditionNumber: Number.isFinite(r.conditionNumber) ? roundSig(r.conditionNumber) : null,
      guaranteedLineSpeedMmPerS: round(
        mToMm(guaranteedLineSpeed(r.jacobian, m, chain.maxSpeedSi, createSpeedScratch(m))),
        1e-6,
      ),
      maxToolSpeedMmPerS: round(mToMm(maxToolSpeed(r.jacobian, m, chain.maxSpeedSi, createSpeedScratch(m))), 1e-6),
      speedNote:
        "guaranteed: the straight-line speed of the tool point reachable in every direction at constant orientation with every joint within its speed limit" +
        (m > 6 ? " (minimum-norm joint rates, redundant arm)" : "") +
        "; max: the largest tool-point speed with all joints at their limits, orientation free",
      singularity: {
        kind: sing.kind,
        nullVector: sing.nullVector.map((v) => round(v, 1e-9)),
        inverseCondition: roundSig(sing.inverseCondition),
        lengthScaleMm: round(mToMm(sing.lengthScaleM), 1e-6),
        note: `kind from the joint motion that moves the tool least; linear rows scaled by ${round(mToMm(sing.lengthScaleM), 1)} mm; "none" above inverse condition ${SINGULAR_INVERSE_CONDITION}`,
      },
      jointFrames,
    },
  };
}
