import { describe, expect, it } from "vitest";
import { csvField, csvLine, csvRound, toCsv } from "../../src/view/csv";

describe("csvField", () => {
  it("neutralises text that a spreadsheet would run as a formula (= + - @, tab, CR) with a leading quote", () => {
    expect(csvField("=SUM(A1:A2)")).toBe("'=SUM(A1:A2)");
    expect(csvField("+1")).toBe("'+1");
    expect(csvField("-J2 - J3")).toBe("'-J2 - J3");
    expect(csvField("@cmd")).toBe("'@cmd");
    expect(csvField("\tx")).toBe("'\tx");
  });

  it("quotes fields with commas, quotes, line breaks or edge spaces, doubling inner quotes (RFC 4180)", () => {
    expect(csvField('say "hi", then go')).toBe('"say ""hi"", then go"');
    expect(csvField("two\nlines")).toBe('"two\nlines"');
    expect(csvField(" padded")).toBe('" padded"');
    expect(csvField("=1,2")).toBe(`"'=1,2"`);
    expect(csvField("plain")).toBe("plain");
  });

  it("writes numbers as numbers: a negative number is data, not a formula", () => {
    expect(csvField(-170)).toBe("-170");
    expect(csvField(0.25)).toBe("0.25");
    expect(csvField(-0)).toBe("0");
    expect(csvField(NaN)).toBe("");
    expect(csvField(null)).toBe("");
    expect(csvField(undefined)).toBe("");
  });
});

describe("toCsv", () => {
  it("writes the header and rows with CRLF after every record", () => {
    expect(
      toCsv(
        ["a", "b"],
        [
          [1, "x"],
          [-2, "=y"],
        ],
      ),
    ).toBe("a,b\r\n1,x\r\n-2,'=y\r\n");
    expect(csvLine(["a", null, 3])).toBe("a,,3");
  });
  it("refuses rows of the wrong length", () => {
    expect(() => toCsv(["a", "b"], [[1]])).toThrow(RangeError);
  });
  it("rounds for the file and keeps missing values empty", () => {
    expect(csvRound(14.660671, 3)).toBe(14.661);
    expect(csvRound(null, 2)).toBeNull();
    expect(csvRound(-0.0001, 2)).toBe(0);
  });
});
