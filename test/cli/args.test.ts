/**
 * Tests of src/cli/args.ts joinNegativeValues, checked against node:util parseArgs itself (the library whose
 * ambiguity rule it works around: a value starting with "-" after a string option is refused as an option).
 */
import { parseArgs } from "node:util";
import { describe, expect, it } from "vitest";
import { joinNegativeValues } from "../../src/cli/args";
import { LINE_OPTIONS } from "../../src/cli/line";
import { POSE_OPTIONS } from "../../src/cli/pose";

describe("joinNegativeValues", () => {
  it("joins an option with a value starting with a minus sign, so parseArgs takes negative coordinates", () => {
    const args = [
      "arm.json",
      "--from",
      "-300,20,600",
      "--to",
      "300,20,600",
      "--orientation",
      "-90,0,0",
      "--speed",
      "500",
    ];
    expect(joinNegativeValues(args, LINE_OPTIONS)).toEqual([
      "arm.json",
      "--from=-300,20,600",
      "--to",
      "300,20,600",
      "--orientation=-90,0,0",
      "--speed",
      "500",
    ]);
    // A following option is not a value.
    expect(joinNegativeValues(["--from", "--to", "1,2,3"], LINE_OPTIONS)).toEqual(["--from", "--to", "1,2,3"]);
  });

  it("pose: parseArgs refuses '--joints -30,…' as it stands and accepts it joined", () => {
    const args = ["arm.json", "--joints", "-30,10,20,0,45,0", "--allow-outside"];
    expect(() => parseArgs({ args, allowPositionals: true, options: POSE_OPTIONS })).toThrow(/ambiguous/i);
    const { values, positionals } = parseArgs({
      args: joinNegativeValues(args, POSE_OPTIONS),
      allowPositionals: true,
      options: POSE_OPTIONS,
    });
    expect(values.joints).toBe("-30,10,20,0,45,0");
    expect(values["allow-outside"]).toBe(true);
    expect(positionals).toEqual(["arm.json"]);
    // A boolean option never takes a value: "-1" after it stays a separate argument.
    expect(joinNegativeValues(["--allow-outside", "-1"], POSE_OPTIONS)).toEqual(["--allow-outside", "-1"]);
  });
});
