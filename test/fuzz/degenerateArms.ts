/**
 * Degenerate chains, written out by hand (invented numbers): each must either be analysed sensibly or be refused
 * with an error whose message says what is "not supported because" of what.
 */
type Json = Record<string, unknown>;

const common = (id: string) => ({
  id,
  maker: "Fuzzwerk",
  model: `Degenerate ${id}`,
  class: "other",
  mountings: ["floor"],
  massKg: 50,
  ratedPayloadKg: 5,
  repeatabilityMm: 0.05,
  protection: "IP54",
  source: { document: "Generated chain", revision: "1", date: "2026-01-01" },
});

const revolute = (name: string, dh: Json, rangeDeg: [number, number] = [-170, 170]) => ({
  name,
  kind: "revolute",
  dh,
  rangeDeg,
  maxSpeedDegPerS: 180,
  ratedTorqueNm: 500,
});
const prismatic = (name: string, dh: Json, rangeMm: [number, number] = [0, 800]) => ({
  name,
  kind: "prismatic",
  dh,
  rangeMm,
  maxSpeedMmPerS: 1000,
  ratedForceN: 2000,
});
const row = (aMm: number, alphaDeg: number, dMm: number, thetaDeg = 0) => ({ aMm, alphaDeg, dMm, thetaDeg });
const flange = (zMm = 0) => ({ xyzMm: [0, 0, zMm], rpyDeg: [0, 0, 0] });

export const DEGENERATE_ARMS: readonly { readonly name: string; readonly arm: Json }[] = [
  {
    // three parallel vertical axes: the flange moves in a horizontal plane only
    name: "parallel consecutive axes (planar 3R)",
    arm: {
      ...common("planar-three"),
      convention: "dh",
      joints: [revolute("J1", row(400, 0, 300)), revolute("J2", row(300, 0, 0)), revolute("J3", row(100, 0, 0))],
      flange: flange(),
    },
  },
  {
    // every link of zero length and the flange on the axes: the flange never moves
    name: "zero-length links",
    arm: {
      ...common("zero-links"),
      convention: "dh",
      joints: [revolute("J1", row(0, 90, 0)), revolute("J2", row(0, -90, 0)), revolute("J3", row(0, 0, 0))],
      flange: flange(),
    },
  },
  {
    // a spherical wrist alone, flange at the common point: orientation only, no positional freedom
    name: "no positional freedom (axes through one point)",
    arm: {
      ...common("wrist-only"),
      convention: "dh",
      joints: [revolute("J1", row(0, -90, 500)), revolute("J2", row(0, 90, 0)), revolute("J3", row(0, 0, 0))],
      flange: flange(),
    },
  },
  {
    // three strokes along the same z axis: one line of positions
    name: "all joints prismatic along one axis",
    arm: {
      ...common("one-axis-slides"),
      convention: "dh",
      joints: [prismatic("J1", row(0, 0, 0)), prismatic("J2", row(0, 0, 100)), prismatic("J3", row(0, 0, 0))],
      flange: flange(50),
    },
  },
  {
    // J1 and J2 turn about the same line (a = 0, α = 0 between them), then an arm
    name: "coincident axes",
    arm: {
      ...common("coincident"),
      convention: "dh",
      joints: [
        revolute("J1", row(0, 0, 200)),
        revolute("J2", row(0, 90, 100)),
        revolute("J3", row(600, 0, 0)),
        revolute("J4", row(400, 0, 0)),
      ],
      flange: flange(),
    },
  },
  {
    // two coincident axes and nothing else: the flange on the axis never moves
    name: "coincident axes, flange on the axis",
    arm: {
      ...common("coincident-only"),
      convention: "dh",
      joints: [revolute("J1", row(0, 0, 200)), revolute("J2", row(0, 0, 100))],
      flange: flange(100),
    },
  },
  {
    // a vertical turn with a point off the axis: positions on a circle only (one-dimensional)
    name: "coincident axes, flange off the axis",
    arm: {
      ...common("coincident-offset"),
      convention: "dh",
      joints: [revolute("J1", row(0, 0, 200)), revolute("J2", row(300, 0, 100))],
      flange: flange(),
    },
  },
  {
    // prismatic strokes along one axis followed by a turn about it
    name: "prismatic stroke then a turn about the same axis",
    arm: {
      ...common("stroke-turn"),
      convention: "dh",
      joints: [prismatic("J1", row(0, 0, 0)), revolute("J2", row(0, 0, 100))],
      flange: flange(50),
    },
  },
  {
    // frames convention: every joint about base z at the base origin, flange at the origin
    name: "frames: coincident z axes at the origin",
    arm: {
      ...common("frames-origin"),
      convention: "frames",
      joints: [
        {
          name: "J1",
          kind: "revolute",
          origin: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
          axis: [0, 0, 1],
          rangeDeg: [-170, 170],
          maxSpeedDegPerS: 180,
        },
        {
          name: "J2",
          kind: "revolute",
          origin: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
          axis: [0, 0, 1],
          rangeDeg: [-170, 170],
          maxSpeedDegPerS: 180,
        },
      ],
      flange: { xyzMm: [0, 0, 0], rpyDeg: [0, 0, 0] },
    },
  },
];
