/**
 * IEC 60529 protection codes (IP codes) for the catalog's "protection at least" filter. A code is "IP" and two
 * characteristic numerals: solids 0–6 and water 0–8, "X" where the numeral is not given (not tested); letters after
 * them (A–D, H, M, S, W) do not change the comparison.
 *
 * When does an arm's code meet a minimum? Each numeral the minimum gives must be met; an "X" in the minimum asks for
 * nothing, an "X" in the arm's code meets nothing. Solids: a higher numeral meets a lower one. Water: numerals 1–6
 * form one ladder (a higher one meets a lower one), 7 (temporary immersion) and 8 (continuous immersion) another;
 * IEC 60529 says an enclosure marked 7 or 8 alone need not meet the jet tests of 5 and 6, and is dual-coded
 * (e.g. IP65/IP67) when it does [from memory: IEC 60529, the clause on the second characteristic numeral]. So an arm
 * marked IP67 does not meet "at least IP65": the arm file holds one code, and the filter does not assume the other.
 */

export interface IpCode {
  /** Solids numeral 0–6, null for "X". */
  readonly solids: number | null;
  /** Water numeral 0–8, null for "X". */
  readonly water: number | null;
}

const IP = /^IP([0-6X])([0-9X])[A-D]?[HMSW]?$/;

/**
 * The numerals of an IP code; null for text that is not one.
 * @example parseIpCode("IP54") // { solids: 5, water: 4 }
 * @example parseIpCode("IPX7") // { solids: null, water: 7 }
 */
export function parseIpCode(code: string): IpCode | null {
  const m = IP.exec(code.trim());
  if (!m) return null;
  const digit = (c: string) => (c === "X" ? null : Number(c));
  const water = digit(m[2]!);
  if (water !== null && water > 8) return null;
  return { solids: digit(m[1]!), water };
}

function waterMeets(arm: number, min: number): boolean {
  if (min === 0) return true;
  if (min >= 7) return arm >= min;
  return arm >= min && arm <= 6;
}

/**
 * Whether an arm's code meets a minimum code (see the module comment).
 * @example protectionMeets("IP65", "IP54") // true
 * @example protectionMeets("IP67", "IP65") // false (7 alone does not include the jets of 5 and 6)
 * @example protectionMeets("IP67", "IPX7") // true
 */
export function protectionMeets(armCode: string, minCode: string): boolean {
  const arm = parseIpCode(armCode);
  const min = parseIpCode(minCode);
  if (!arm || !min) return false;
  if (min.solids !== null && min.solids > 0 && (arm.solids === null || arm.solids < min.solids)) return false;
  if (min.water !== null && min.water > 0 && (arm.water === null || !waterMeets(arm.water, min.water))) return false;
  return true;
}
