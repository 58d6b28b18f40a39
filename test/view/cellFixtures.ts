/**
 * Small hand-written cell studies for the view and chart tests: invented arms ("arm-a", "arm-b"), invented numbers,
 * in the shape of `armdex cell` (CellStudyJson). The tests check how the pages present these numbers; the numbers
 * themselves are inputs, not results of the core.
 */
import type { CellArmJson, CellSpec, CellStudyJson, PlacementMapJson } from "../../src/core";

export const CELL: CellSpec = {
  id: "test-cell",
  title: "Test cell",
  description: "Invented.",
  candidates: ["arm-a", "arm-b"],
  placement: { positionMm: [0, 0, 500], rpyDeg: [0, 0, 0] },
  placements: { "arm-b": { positionMm: [1000, 0, 2000], rpyDeg: [180, 0, 0] } },
  tool: { tcp: { xyzMm: [0, 30, 40], rpyDeg: [0, 0, 0] }, bodies: [{ name: "gripper", massKg: 2, cogMm: [0, 0, 50] }] },
  parts: [{ name: "box", massKg: 3, cogMm: [0, 0, 100] }],
  targets: [
    { name: "pick", positionMm: [600, -200, 300], rpyDeg: [180, 0, 0] },
    { name: "above pick", relativeTo: "pick", offsetMm: [0, 0, 100] },
    { name: "place", positionMm: [600, 400, 500], rpyDeg: [180, 0, 0] },
  ],
  cycle: [
    { to: "above pick", motion: "joint", speedPercent: 80 },
    { to: "pick", motion: "linear", speedMmPerS: 250, dwellS: 0.5, grip: "box" },
    { to: "place", motion: "joint", release: true },
  ],
  requirements: { maxCycleS: 4, minJointMarginDeg: 5 },
};

const load = (carrying: string | null, massKg: number, ok: boolean): CellArmJson["toolLoad"][number] => ({
  carrying,
  massKg,
  cogMm: [0, 0, 80],
  inertiaAboutCogKgM2: { xx: 0.01, yy: 0.01, zz: 0.02, xy: 0, xz: 0, yz: 0 },
  ratedPayloadKg: 10,
  withinRatedPayload: massKg <= 10,
  ratings: [
    {
      joint: "J5",
      axis: "bend",
      leverMm: 150,
      momentNm: 12,
      allowedMomentNm: ok ? 40 : 10,
      inertiaKgM2: 0.2,
      allowedInertiaKgM2: 1,
      ok,
    },
  ],
  limiting: "J5",
  loadDiagram: { lzMm: 80, lxyMm: 0 },
});

const target = (name: string, marginDeg: number | null, joint: string | null): CellArmJson["targets"][number] => ({
  name,
  reachable: marginDeg !== null,
  solutions: marginDeg !== null ? 4 : 0,
  reason: marginDeg !== null ? null : "out of reach",
  jointsDeg: marginDeg !== null ? [10, -20.25, 30, 0, 45, -170] : null,
  jointMarginDeg: marginDeg,
  tightestJoint: joint,
  jointMarginMm: null,
  inverseCondition: marginDeg !== null ? 0.2345 : null,
  holding:
    marginDeg !== null
      ? [
          { joint: "J2", torqueNm: 90, ratedNm: 300, ok: true },
          { joint: "J3", torqueNm: 60, ratedNm: 120, ok: true },
        ]
      : [],
});

/** arm-a passes (cycle 3.5 s = 1 + 1.5 + 0.5 dwell + 0.5); arm-b fails (the place is out of reach). */
export const STUDY: CellStudyJson = {
  cell: "test-cell",
  arms: [
    {
      arm: "arm-a",
      verdict: "pass",
      reasons: [],
      rank: 1,
      placement: { positionMm: [0, 0, 500], rpyDeg: [0, 0, 0], mounting: "floor" },
      toolLoad: [load(null, 2, true), load("box", 5, true)],
      targets: [target("pick", 12.5, "J3"), target("above pick", 8.25, "J5"), target("place", 20, "J1")],
      moves: [
        {
          step: 1,
          from: "place",
          to: "above pick",
          motion: "joint",
          timeS: 1,
          dwellS: 0,
          limitedBy: "J1 speed",
          feasible: true,
          problem: null,
          carrying: null,
          jointsDeg: [1, 2, 3, 4, 5, 6],
          peakToolSpeedMmPerS: null,
          minInverseCondition: null,
        },
        {
          step: 2,
          from: "above pick",
          to: "pick",
          motion: "linear",
          timeS: 1.5,
          dwellS: 0.5,
          limitedBy: "tool speed 250 mm/s",
          feasible: true,
          problem: null,
          carrying: null,
          jointsDeg: [1, 2, 3, 4, 5, 6],
          peakToolSpeedMmPerS: 250,
          minInverseCondition: 0.2,
        },
        {
          step: 3,
          from: "pick",
          to: "place",
          motion: "joint",
          timeS: 0.5,
          dwellS: 0,
          limitedBy: "J2 acceleration",
          feasible: true,
          problem: null,
          carrying: "box",
          jointsDeg: [1, 2, 3, 4, 5, 6],
          peakToolSpeedMmPerS: null,
          minInverseCondition: null,
        },
      ],
      cycleTimeS: 3.5,
      accelerationAssumed: ["J1", "J2", "J3", "J4", "J6"],
      tightestMarginDeg: 8.25,
    },
    {
      arm: "arm-b",
      verdict: "fail",
      reasons: ["J5 moment 12 N·m > 10 N·m (tool with box)", "place: out of reach", "a", "b"],
      rank: null,
      placement: { positionMm: [1000, 0, 2000], rpyDeg: [180, 0, 0], mounting: "ceiling" },
      toolLoad: [load(null, 2, false), load("box", 12, false)],
      targets: [target("pick", 3, "J2"), target("above pick", 4, "J2"), target("place", null, null)],
      moves: [
        {
          step: 1,
          from: "place",
          to: "above pick",
          motion: "joint",
          timeS: null,
          dwellS: 0,
          limitedBy: null,
          feasible: false,
          problem: { kind: "out-of-reach", positionMm: [600, 400, 500] },
          carrying: null,
          jointsDeg: null,
          peakToolSpeedMmPerS: null,
          minInverseCondition: null,
        },
        {
          step: 2,
          from: "above pick",
          to: "pick",
          motion: "linear",
          timeS: 0.8,
          dwellS: 0.5,
          limitedBy: "J4 speed",
          feasible: true,
          problem: null,
          carrying: null,
          jointsDeg: [1, 2, 3, 4, 5, 6],
          peakToolSpeedMmPerS: 250,
          minInverseCondition: 0.2,
        },
        {
          step: 3,
          from: "pick",
          to: "place",
          motion: "joint",
          timeS: null,
          dwellS: 0,
          limitedBy: null,
          feasible: false,
          problem: { kind: "singularity", positionMm: [610.4, -12, 700], joint: "J5" },
          carrying: "box",
          jointsDeg: null,
          peakToolSpeedMmPerS: null,
          minInverseCondition: null,
        },
      ],
      cycleTimeS: null,
      accelerationAssumed: [],
      tightestMarginDeg: 3,
    },
  ],
};

export const PLACEMENT_A: PlacementMapJson = {
  cell: "test-cell",
  arm: "arm-a",
  gridMm: 50,
  planeZMm: 500,
  xMm: [-50, 0, 50],
  yMm: [0, 50],
  feasible: [
    [1, 1, 0],
    [0, 1, 1],
  ],
  feasibleAreaM2: 0.01,
  marginDeg: [
    [10, 12, null],
    [null, 8, 9],
  ],
  yawDeg: null,
  best: { positionMm: [50, 50, 500], yawDeg: 0, cycleTimeS: 3.25 },
  current: { positionMm: [0, 0, 500], rpyDeg: [0, 0, 0] },
  search: { coarseStepMm: 200, evaluated: 7 },
};

export const ARM_HASHES = {
  "arm-a": "0123456789abcdef0123456789abcdef0123456789abcdef0123456789abcdef",
  "arm-b": "fedcba9876543210fedcba9876543210fedcba9876543210fedcba9876543210",
};
