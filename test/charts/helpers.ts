/** Small readers for SVG strings in chart tests (no DOM): elements by tag and class, attributes, path coordinates. */

/** Every start tag `<tag …>` whose class list contains all of `classes`. */
export function elements(svg: string, tag: string, ...classes: string[]): string[] {
  const re = new RegExp(`<${tag}\\b[^>]*>`, "g");
  return (svg.match(re) ?? []).filter((t) => {
    const cls = attr(t, "class")?.split(/\s+/) ?? [];
    return classes.every((c) => cls.includes(c));
  });
}

/** The value of attribute `name` in a start tag (entities left as written). */
export function attr(tag: string, name: string): string | null {
  const m = tag.match(new RegExp(`\\s${name}="([^"]*)"`));
  return m ? m[1]! : null;
}

/** Text of every <text> element with the class, entities decoded for &amp; &lt; &gt; &quot; &#39;. */
export function texts(svg: string, cls?: string): string[] {
  const out: string[] = [];
  for (const m of svg.matchAll(/<text\b([^>]*)>([^<]*)<\/text>/g)) {
    const classes = (m[1]!.match(/class="([^"]*)"/)?.[1] ?? "").split(/\s+/);
    if (cls && !classes.includes(cls)) continue;
    out.push(
      m[2]!
        .replace(/&lt;/g, "<")
        .replace(/&gt;/g, ">")
        .replace(/&quot;/g, '"')
        .replace(/&#39;/g, "'")
        .replace(/&amp;/g, "&"),
    );
  }
  return out;
}

/** Absolute coordinates of a path made of M, L and Z commands (what d3-shape's line writes). */
export function pathPoints(d: string): [number, number][] {
  const out: [number, number][] = [];
  for (const m of d.matchAll(/[ML]\s*(-?[\d.]+)[ ,](-?[\d.]+)/g)) out.push([Number(m[1]), Number(m[2])]);
  return out;
}

/** Number of subpaths (M commands). */
export function subpaths(d: string): number {
  return (d.match(/M/g) ?? []).length;
}

/** [minX, maxX, minY, maxY] of points. */
export function bounds(points: readonly (readonly [number, number])[]): [number, number, number, number] {
  const xs = points.map((p) => p[0]);
  const ys = points.map((p) => p[1]);
  return [Math.min(...xs), Math.max(...xs), Math.min(...ys), Math.max(...ys)];
}

/** Checks every chart must pass: accessible name and description, no style attributes, well-formed root. */
export function expectAccessible(
  svg: string,
  expect: (v: unknown) => { toBe(x: unknown): void; toMatch(x: RegExp): void; not: { toMatch(x: RegExp): void } },
): void {
  expect(svg.startsWith("<svg")).toBe(true);
  expect(svg.endsWith("</svg>")).toBe(true);
  expect(svg).toMatch(/^<svg[^>]* role="img"/);
  expect(svg).toMatch(/^<svg[^>]* aria-label="[^"]+"/);
  expect(svg).toMatch(/<title id="[^"]+">[^<]+<\/title>/);
  expect(svg).toMatch(/<desc id="[^"]+">[^<]+<\/desc>/);
  expect(svg).not.toMatch(/\sstyle=/);
  expect(svg).not.toMatch(/<script/);
}
