/**
 * assertInDelta-style comparisons with a stated tolerance (STYLE.md C14). Every call names its tolerance; the
 * failure message lists the worst element, its index, both values and the tolerance, so a failing check can be
 * read without a debugger.
 */
import { expect } from "vitest";

type Numbers = number | ArrayLike<number>;

function toArray(v: Numbers): number[] {
  return typeof v === "number" ? [v] : Array.from(v);
}

function compare(
  actual: Numbers,
  expected: Numbers,
  bound: (e: number) => number,
  kind: string,
  tol: number,
  label: string,
): void {
  const a = toArray(actual),
    e = toArray(expected);
  expect(a.length, `${label}: length`).toBe(e.length);
  expect(e.length, `${label}: nothing to compare`).toBeGreaterThan(0);
  let worst = -1,
    worstExcess = -Infinity;
  for (let i = 0; i < e.length; i++) {
    const ai = a[i]!,
      ei = e[i]!;
    expect(Number.isFinite(ai), `${label}: actual[${i}] = ${ai} is not finite`).toBe(true);
    const excess = Math.abs(ai - ei) - bound(ei);
    if (excess > worstExcess) {
      worstExcess = excess;
      worst = i;
    }
  }
  const ai = a[worst]!,
    ei = e[worst]!;
  expect(
    worstExcess <= 0,
    `${label}: element ${worst}: actual ${ai}, expected ${ei}, |diff| ${Math.abs(ai - ei)} > ${kind} tolerance ${tol}`,
  ).toBe(true);
}

/** Element-wise |actual − expected| ≤ tolAbs. */
export function expectClose(actual: Numbers, expected: Numbers, tolAbs: number, label = "expectClose"): void {
  compare(actual, expected, () => tolAbs, "absolute", tolAbs, label);
}

/** Element-wise |actual − expected| ≤ tolRel · max(|expected|, floor) (floor guards expected values near 0). */
export function expectRelClose(
  actual: Numbers,
  expected: Numbers,
  tolRel: number,
  label = "expectRelClose",
  floor = 1e-300,
): void {
  compare(actual, expected, (e) => tolRel * Math.max(Math.abs(e), floor), "relative", tolRel, label);
}
