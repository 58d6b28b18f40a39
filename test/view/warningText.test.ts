/** Sentences of analysis warnings: built from the codes and numbers alone, in one place. */
import { describe, expect, it } from "vitest";
import { analysisWarningText, cycleFailureText } from "../../src/view/warningText";

describe("analysisWarningText", () => {
  it("words every code with its numbers", () => {
    expect(
      analysisWarningText({
        code: "stated-reach-mismatch",
        statedMm: 1.45,
        computedMm: 1450,
        basis: "flange",
        deviationPercent: -99.9,
        unitsSuspect: true,
      }),
    ).toBe(
      "stated reach 1.45 mm differs from the computed flange reach 1450 mm by -99.9 % (more than 2 %); check the units (metres typed as millimetres?)",
    );
    expect(analysisWarningText({ code: "repeatability-implausible", repeatabilityMm: 5, minMm: 0.005, maxMm: 2 })).toBe(
      "declared repeatability 5 mm is outside the usual 0.005–2 mm (common practice, no source)",
    );
    expect(
      analysisWarningText({
        code: "payload-above-wrist-rating",
        kind: "moment",
        joint: "J5",
        ratedPayloadKg: 12,
        allowedKg: 10.197,
        rating: 10,
        leverMm: 100,
      }),
    ).toBe(
      "rated payload 12 kg exceeds the 10.2 kg that the J5 moment rating (10 N·m) allows with the CG at the flange centre (lever 100 mm)",
    );
    expect(
      analysisWarningText({ code: "cycle-not-computed", reason: "point-unreachable", point: "B up", rMm: 900 }),
    ).toBe("point B up of the cycle cannot be reached with the tool down");
  });

  it("words each cycle failure", () => {
    expect(cycleFailureText({ reason: "start-unreachable", point: null }, 1200)).toBe(
      "the cycle start at 1200 mm reach cannot be reached with the tool down",
    );
    expect(cycleFailureText({ reason: "no-location", point: null }, null)).toBe(
      "no location with the tool pointing down was found for the cycle",
    );
  });
});
