/**
 * SVG string helpers shared by the charts: escaping, attributes, numbers with a set number of digits, the chart root
 * element with its accessible name and description. Pure; no DOM.
 */

/**
 * Text safe for XML content and attribute values (&, <, >, ", ').
 * @example escapeXml(`a < b & "c"`) // "a &lt; b &amp; &quot;c&quot;"
 */
export function escapeXml(text: string): string {
  return text.replace(/[&<>"']/g, (c) =>
    c === "&" ? "&amp;" : c === "<" ? "&lt;" : c === ">" ? "&gt;" : c === '"' ? "&quot;" : "&#39;",
  );
}

/**
 * A number with at most `digits` decimals, trailing zeros dropped, no "-0", ASCII minus (for coordinates).
 * @example fmt(12.3456, 1) // "12.3"
 * @example fmt(-0.04, 1) // "0"
 * @example fmt(3, 2) // "3"
 */
export function fmt(value: number, digits = 1): string {
  if (!Number.isFinite(value)) throw new RangeError(`invalid value: ${value}`);
  const text = value.toFixed(digits);
  const trimmed = text.includes(".") ? text.replace(/0+$/, "").replace(/\.$/, "") : text;
  return trimmed === "-0" ? "0" : trimmed;
}

export type AttrValue = string | number | boolean | null | undefined;

/**
 * Attributes as ` name="value"` pairs, values escaped; null, undefined and false are left out; true writes the bare
 * name's value as the name (`hidden="hidden"`); numbers get at most 2 decimals.
 * @example attrs({ class: "axis", x: 1.234, hidden: false }) // ' class="axis" x="1.23"'
 */
export function attrs(record: Readonly<Record<string, AttrValue>>): string {
  let out = "";
  for (const [name, value] of Object.entries(record)) {
    if (value === null || value === undefined || value === false) continue;
    if (!/^[a-zA-Z_:][-a-zA-Z0-9_:.]*$/.test(name)) throw new RangeError(`invalid attribute name: ${name}`);
    if (name === "style") throw new RangeError("style attributes are not allowed (the CSP forbids them): use a class");
    const text = value === true ? name : typeof value === "number" ? fmt(value, 2) : value;
    out += ` ${name}="${escapeXml(text)}"`;
  }
  return out;
}

/**
 * One element: `el("path", { class: "a", d })` → `<path class="a" d="…"/>`; children are SVG strings (not escaped).
 */
export function el(
  tag: string,
  attributes: Readonly<Record<string, AttrValue>>,
  ...children: readonly string[]
): string {
  const body = children.join("");
  return body === "" ? `<${tag}${attrs(attributes)}/>` : `<${tag}${attrs(attributes)}>${body}</${tag}>`;
}

/** A <text> element with escaped content. */
export function textEl(content: string, attributes: Readonly<Record<string, AttrValue>>): string {
  return `<text${attrs(attributes)}>${escapeXml(content)}</text>`;
}

/** What every chart function returns: the SVG and the words that go with it. */
export interface ChartResult {
  /** Element id of the <svg> (unique on a page). */
  readonly id: string;
  /** Visible title, also the accessible name. */
  readonly title: string;
  /** Accessible description (the chart's content in a sentence or two). */
  readonly description: string;
  /** Caption for the figure: what the chart assumes. */
  readonly caption: string;
  readonly svg: string;
  readonly widthPx: number;
  readonly heightPx: number;
}

export interface ChartFrame {
  readonly id: string;
  readonly title: string;
  readonly description: string;
  readonly widthPx: number;
  readonly heightPx: number;
  /** Extra class on the root, after "chart". */
  readonly className?: string;
}

/** Element ids must be plain: letters, digits, "-" and "_". */
export function checkId(id: string): string {
  if (!/^[A-Za-z][-A-Za-z0-9_]*$/.test(id)) throw new RangeError(`invalid chart id: ${id}`);
  return id;
}

/**
 * The root <svg>: role="img", aria-label (the title), <title> and <desc> linked by aria-describedby, a visible
 * title in the top left, then `body`.
 */
export function svgRoot(frame: ChartFrame, body: string): string {
  const id = checkId(frame.id);
  if (!(frame.widthPx > 0) || !(frame.heightPx > 0))
    throw new RangeError(`invalid size: ${frame.widthPx}×${frame.heightPx}`);
  return (
    `<svg${attrs({
      xmlns: "http://www.w3.org/2000/svg",
      id,
      class: frame.className ? `chart ${frame.className}` : "chart",
      viewBox: `0 0 ${fmt(frame.widthPx, 1)} ${fmt(frame.heightPx, 1)}`,
      width: Math.round(frame.widthPx),
      height: Math.round(frame.heightPx),
      role: "img",
      "aria-label": frame.title,
      "aria-describedby": `${id}-desc`,
    })}>` +
    `<title id="${id}-title">${escapeXml(frame.title)}</title>` +
    `<desc id="${id}-desc">${escapeXml(frame.description)}</desc>` +
    textEl(frame.title, { class: "chart-title", x: 8, y: 18 }) +
    body +
    "</svg>"
  );
}

/** Number formatting for labels: English thousands separators, true minus sign, at most `digits` decimals. */
export function label(value: number, digits = 0): string {
  if (!Number.isFinite(value)) throw new RangeError(`invalid value: ${value}`);
  const text = value.toLocaleString("en", { maximumFractionDigits: digits, minimumFractionDigits: 0 });
  return text === "-0" ? "0" : text.replace(/^-/, "\u2212");
}

/** The line of axis 1 at x = xPx across the plot area (the side views draw it where r = 0). */
export function axis1LineSvg(xPx: number, area: { readonly top: number; readonly height: number }): string {
  return el("line", { class: "axis1", x1: fmt(xPx), x2: fmt(xPx), y1: fmt(area.top), y2: fmt(area.top + area.height) });
}
