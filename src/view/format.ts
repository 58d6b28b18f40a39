/**
 * Display formatting: numbers are rounded here and only here (never in core or catalog). English number style with
 * thousands separators, a true minus sign, and units joined by a no-break space.
 */

/** Shown where a file gives no value. */
export const NOT_STATED = "not stated";

/** No-break space between a number and its unit. */
export const UNIT_SPACE = "\u00a0";

const formatters = new Map<number, Intl.NumberFormat>();

function formatter(maxFractionDigits: number): Intl.NumberFormat {
  let f = formatters.get(maxFractionDigits);
  if (!f) {
    f = new Intl.NumberFormat("en", { maximumFractionDigits: maxFractionDigits });
    formatters.set(maxFractionDigits, f);
  }
  return f;
}

/**
 * A number for display, at most `maxFractionDigits` decimals, trailing zeros dropped.
 * @example formatNumber(1250) // "1,250"
 * @example formatNumber(-170) // "−170"
 * @example formatNumber(0.0200, 3) // "0.02"
 */
export function formatNumber(value: number, maxFractionDigits = 0): string {
  if (!Number.isFinite(value)) throw new RangeError(`invalid value: ${value}`);
  const text = formatter(maxFractionDigits).format(value);
  return text === "-0" ? "0" : text.replace(/^-/, "\u2212");
}

/**
 * A number with its unit.
 * @example formatQuantity(7, "kg", 1) // "7 kg" (with a no-break space)
 * @example formatQuantity(250, "°/s") // "250 °/s"
 */
export function formatQuantity(value: number, unit: string, maxFractionDigits = 0): string {
  return `${formatNumber(value, maxFractionDigits)}${unit === "°" ? "" : UNIT_SPACE}${unit}`;
}

/** Like formatQuantity, but "not stated" for a missing value. */
export function formatOptionalQuantity(value: number | undefined, unit: string, maxFractionDigits = 0): string {
  return value === undefined ? NOT_STATED : formatQuantity(value, unit, maxFractionDigits);
}

/**
 * A [min, max] range.
 * @example formatRange(-170, 170, "°") // "−170° to 170°"
 * @example formatRange(0, 200, "mm") // "0 to 200 mm"
 */
export function formatRange(min: number, max: number, unit: string, maxFractionDigits = 0): string {
  return unit === "°"
    ? `${formatQuantity(min, unit, maxFractionDigits)} to ${formatQuantity(max, unit, maxFractionDigits)}`
    : `${formatNumber(min, maxFractionDigits)} to ${formatQuantity(max, unit, maxFractionDigits)}`;
}

/**
 * A price with its ISO 4217 code after it, whole units.
 * @example formatPrice(31500, "EUR") // "31,500 EUR"
 */
export function formatPrice(amount: number, currency: string): string {
  return `${formatNumber(amount, 0)}${UNIT_SPACE}${currency}`;
}

/**
 * A three-component vector.
 * @example formatVector([0, -12.5, 80], 1) // "(0, −12.5, 80)"
 */
export function formatVector(values: readonly number[], maxFractionDigits = 2): string {
  return `(${values.map((v) => formatNumber(v, maxFractionDigits)).join(", ")})`;
}

/** Words joined with commas: ["floor", "ceiling"] → "floor, ceiling". */
export function formatList(items: readonly string[]): string {
  return items.join(", ");
}
