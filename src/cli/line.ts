/**
 * `armdex line`: the straight-line check of one arm as JSON (file units outside: mm, deg, mm/s). Pure: parses the
 * option strings, calls the core's lineCheck, rounds for display. The key names are a contract (issue 6): add
 * keys freely, do not rename.
 */
import type { Arm } from "../catalog";
import {
  checkLineMm,
  DEFAULT_LINE_CHECK,
  degToRad,
  gravityDirectionInBase,
  lineToolRotation,
  mmToM,
  type LineCheckResult,
  type LineOrientationSpec,
} from "../core";
import { parseNumberList, type CommandResult } from "./pose";

/** Option strings as they come from the command line. */
export interface LineArgs {
  readonly from?: string | undefined;
  readonly to?: string | undefined;
  readonly orientation?: string | undefined;
  readonly speed?: string | undefined;
  readonly startJoints?: string | undefined;
  readonly tool?: string | undefined;
  readonly samples?: string | undefined;
}

export const DEFAULT_LINE_SAMPLES = DEFAULT_LINE_CHECK.samples;

/** The options of `armdex line` (node:util parseArgs form). */
export const LINE_OPTIONS = {
  from: { type: "string" },
  to: { type: "string" },
  orientation: { type: "string" },
  speed: { type: "string" },
  "start-joints": { type: "string" },
  tool: { type: "string" },
  samples: { type: "string" },
} as const;

/** Rounds every number to 9 significant digits (display only; removes float noise such as 1e-13 mm). */
function roundDeep(value: unknown): unknown {
  if (typeof value === "number")
    return Number.isFinite(value) ? (Math.abs(value) < 1e-9 ? 0 : Number(value.toPrecision(9)) + 0) : null;
  if (Array.isArray(value)) return value.map(roundDeep);
  if (value !== null && typeof value === "object") {
    return Object.fromEntries(Object.entries(value as Record<string, unknown>).map(([k, v]) => [k, roundDeep(v)]));
  }
  return value;
}

const usage = (message: string): CommandResult<never> => ({ ok: false, usage: true, message });

/**
 * Runs the line check for `arm` with command-line option strings.
 * @returns the JSON value, or a usage error (exit 2) with a message naming the option
 */
export function lineCommand(arm: Arm, args: LineArgs): CommandResult<Record<string, unknown>> {
  const chain = arm.chain;
  const m = chain.drivenCount;
  const driven = Array.from(chain.drivenJoint, (k) => arm.spec.joints[k]!);
  if (args.from === undefined) return usage("line needs --from x,y,z (TCP start in the base frame, mm)");
  if (args.to === undefined) return usage("line needs --to x,y,z (TCP end in the base frame, mm)");
  if (args.orientation === undefined) return usage("line needs --orientation down|outward|roll,pitch,yaw (deg)");
  if (args.speed === undefined) return usage("line needs --speed mm/s (commanded TCP speed)");
  const fromMm = parseNumberList(args.from, "--from", 3);
  if (typeof fromMm === "string") return usage(fromMm);
  const toMm = parseNumberList(args.to, "--to", 3);
  if (typeof toMm === "string") return usage(toMm);
  if (fromMm.every((v, i) => v === toMm[i])) return usage("--from and --to are the same point: the line has no length");
  const speed = Number(args.speed.trim());
  if (args.speed.trim() === "" || !Number.isFinite(speed) || speed <= 0)
    return usage(`--speed: expected a positive number of mm/s, found ${JSON.stringify(args.speed)}`);
  let toolMm = [0, 0, 0];
  if (args.tool !== undefined) {
    const t = parseNumberList(args.tool, "--tool", 3);
    if (typeof t === "string") return usage(t);
    toolMm = t;
  }
  let samples = DEFAULT_LINE_SAMPLES;
  if (args.samples !== undefined) {
    samples = Number(args.samples.trim());
    if (!Number.isInteger(samples) || samples < 2 || samples > 10_001)
      return usage(`--samples: expected a whole number from 2 to 10001, found ${JSON.stringify(args.samples)}`);
  }
  let startJointsSi: number[] | undefined;
  if (args.startJoints !== undefined) {
    const q = parseNumberList(args.startJoints, "--start-joints", m);
    if (typeof q === "string")
      return usage(`${q} (driven joints of ${arm.id}: ${driven.map((j) => j.name).join(", ")}; deg or mm)`);
    startJointsSi = q.map((v, i) => (driven[i]!.kind === "prismatic" ? mmToM(v) : degToRad(v)));
  }
  const mounting = arm.spec.mountings[0] ?? "floor";
  const gravity = gravityDirectionInBase(mounting);
  const text = args.orientation.trim();
  let spec: LineOrientationSpec;
  let orientation: Record<string, unknown>;
  if (text === "down" || text === "outward") {
    spec = text;
    orientation = {
      name: text,
      note:
        text === "down"
          ? `tool z along gravity (${mounting} mounting), tool x pointing away from axis 1 at the line's start`
          : "tool z pointing away from axis 1 at the line's start (perpendicular to it), tool x towards gravity",
    };
  } else {
    const rpy = parseNumberList(text, "--orientation", 3);
    if (typeof rpy === "string") return usage(`${rpy}; expected down, outward or roll,pitch,yaw in deg`);
    spec = { rpyDeg: [rpy[0]!, rpy[1]!, rpy[2]!] };
    orientation = { name: "rpy", rpyDeg: rpy, note: "R = Rz(yaw)·Ry(pitch)·Rx(roll), fixed axes (as URDF)" };
  }
  const rotation = lineToolRotation(chain, gravity, fromMm, spec);
  const result: LineCheckResult = checkLineMm(chain, gravity, fromMm, toMm, spec, speed, {
    samples,
    toolMm,
    startJointsSi,
  });
  return {
    ok: true,
    value: roundDeep({
      arm: arm.id,
      specHash: arm.specHash,
      fromMm,
      toMm,
      orientation: {
        ...orientation,
        rotation: [0, 1, 2].map((r) => [rotation[r * 3]!, rotation[r * 3 + 1]!, rotation[r * 3 + 2]!]),
      },
      toolMm,
      ...result,
      notes: [
        "Computed with idealised rigid-body kinematics from the arm file: joint rates needed to keep the tool on the line at constant orientation, against each joint's declared speed limit. No acceleration limits, controller behaviour, payload dynamics or blending; not a maker specification and not safety data.",
        "feasibleConstantSpeedMmPerS: the largest constant speed the whole line allows; 0 when no start branch follows the whole line (a point out of reach, a joint leaving its range, a joint jump, or a pose needing an unbounded rate: startBranches[].reason says which); speedProfile: the largest speed per sample if the controller may slow down locally.",
        "rateRatios: |needed joint rate| / joint speed limit at the commanded speed; above 1 the joint cannot keep up. jointsDeg and joint rates are in mm and mm/s for prismatic joints.",
        `Start branch: ${result.startRule === "best run" ? "of the IK solutions at the start (one per branch name), the fastest run that follows the whole line within reach, within the joint ranges and without a jump; when none does, the run with the fewest problems (jumps, range violations, out-of-reach intervals), then the highest speed its joint rates allow, then the start nearest the zero pose" : "the IK solution nearest --start-joints"}.`,
        "inverseCondition: σ_min/σ_max of the Jacobian with its linear rows divided by the arm's characteristic length (1 isotropic, 0 singular); the singularity kind comes from the joint motion that moves the tool least.",
      ],
    }) as Record<string, unknown>,
  };
}
