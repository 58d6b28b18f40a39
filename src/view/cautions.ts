/**
 * The cautions every arm page, the methods page, the footer and the README carry. One source for all of them.
 * Wording rule: figures are "computed", "declared" or "not stated"; never claim conformity or suitability.
 */

export interface Cautions {
  readonly heading: string;
  /** Paragraphs, plain text. */
  readonly paragraphs: readonly string[];
  /** One-sentence version for the footer. */
  readonly summary: string;
  readonly standards: readonly { readonly code: string; readonly title: string }[];
}

export const CAUTIONS: Cautions = {
  heading: "What these figures are, and what they are not",
  paragraphs: [
    "Kinematic figures are computed from the parameters shown, with idealised rigid-body kinematics: no controller " +
      "limits, no link flexibility, no payload dynamics unless stated. They are meant for early comparison of arms.",
    "They are not maker specifications, not guarantees, not safety data and not a risk assessment. Declared figures " +
      "are copied from the source document named on each arm page; where a file gives no value, the page says " +
      "\u201cnot stated\u201d.",
    "Stopping distances, safeguarding, collaborative limits and payload suitability come from the maker\u2019s " +
      "documentation and a risk assessment by competent people. See ISO 10218-1 and ISO 10218-2, ISO 12100 and " +
      "ISO/TS 15066; local codes and qualified safety practice decide.",
  ],
  summary:
    "Kinematic figures are computed from the parameters shown with idealised rigid-body kinematics, for early " +
    "comparison: not maker specifications, not guarantees, not safety data, not a risk assessment. See ISO 10218-1/-2, " +
    "ISO 12100 and ISO/TS 15066; local codes and qualified safety practice decide.",
  standards: [
    { code: "ISO 10218-1", title: "Robotics \u2014 Safety requirements \u2014 Part 1: Industrial robots" },
    {
      code: "ISO 10218-2",
      title: "Robotics \u2014 Safety requirements \u2014 Part 2: Industrial robot applications and robot cells",
    },
    {
      code: "ISO 12100",
      title: "Safety of machinery \u2014 General principles for design \u2014 Risk assessment and risk reduction",
    },
    { code: "ISO/TS 15066", title: "Robots and robotic devices \u2014 Collaborative robots" },
  ],
};
