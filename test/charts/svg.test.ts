import { describe, expect, it } from "vitest";
import { attrs, el, escapeXml, fmt, label, svgRoot, textEl } from "../../src/charts/svg";

describe("escapeXml", () => {
  it("escapes the five XML specials", () => {
    expect(escapeXml(`a < b & "c" > 'd'`)).toBe("a &lt; b &amp; &quot;c&quot; &gt; &#39;d&#39;");
  });
});

describe("fmt", () => {
  it("writes at most the set digits, drops trailing zeros and negative zero", () => {
    expect(fmt(12.3456, 1)).toBe("12.3");
    expect(fmt(3, 2)).toBe("3");
    expect(fmt(2.5, 2)).toBe("2.5");
    expect(fmt(-0.04, 1)).toBe("0");
    expect(fmt(-12.06, 1)).toBe("-12.1");
  });
  it("rejects non-finite values", () => {
    expect(() => fmt(NaN)).toThrow(RangeError);
  });
});

describe("label", () => {
  it("uses thousands separators and a true minus sign", () => {
    expect(label(1250)).toBe("1,250");
    expect(label(-400)).toBe("\u2212400");
    expect(label(0.25, 2)).toBe("0.25");
  });
});

describe("attrs and elements", () => {
  it("skips empty values, escapes text and rounds numbers", () => {
    expect(attrs({ class: "a&b", x: 1.234, hidden: false, y: undefined })).toBe(' class="a&amp;b" x="1.23"');
  });
  it("refuses style attributes (the CSP forbids them)", () => {
    expect(() => attrs({ style: "fill:red" })).toThrow(/style/);
  });
  it("writes self-closing and nested elements, escaping text content", () => {
    expect(el("rect", { width: 2 })).toBe('<rect width="2"/>');
    expect(el("g", {}, el("rect", {}))).toBe("<g><rect/></g>");
    expect(textEl("<b>", { x: 1 })).toBe('<text x="1">&lt;b&gt;</text>');
  });
});

describe("svgRoot", () => {
  it("gives the chart role img, an aria-label, a title and a description, all escaped", () => {
    const svg = svgRoot(
      { id: "demo", title: 'Arm "A" & <B>', description: "A chart.", widthPx: 300, heightPx: 200 },
      "",
    );
    expect(svg).toContain('role="img"');
    expect(svg).toContain('aria-label="Arm &quot;A&quot; &amp; &lt;B&gt;"');
    expect(svg).toContain('<title id="demo-title">Arm &quot;A&quot; &amp; &lt;B&gt;</title>');
    expect(svg).toContain('<desc id="demo-desc">A chart.</desc>');
    expect(svg).toContain('aria-describedby="demo-desc"');
    expect(svg).toContain('viewBox="0 0 300 200"');
  });
  it("rejects ids that are not plain", () => {
    expect(() => svgRoot({ id: "a b", title: "t", description: "d", widthPx: 1, heightPx: 1 }, "")).toThrow(RangeError);
  });
});
