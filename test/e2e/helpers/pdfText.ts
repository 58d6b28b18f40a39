/**
 * The text of each page of a PDF that Chromium wrote (Skia's PDF back end), read with node:zlib only: enough to find
 * strings on pages, not a general PDF reader. Skia writes plain `n 0 obj … endobj` objects (no object streams, no
 * cross-reference streams), FlateDecode content streams, and text as Type0 fonts with Identity-H 2-byte codes and a
 * ToUnicode CMap each (bfchar and bfrange entries, PDF 32000-1 §9.10.3); a ligature glyph sits in a span whose
 * ActualText gives its letters (§14.9.4). Page order is the page tree's order
 * (PDF 32000-1 §7.7.3). Anything else (another producer, encryption) is reported as an error, not guessed at.
 */
import { inflateSync } from "node:zlib";

interface PdfObject {
  readonly dict: string;
  readonly stream: Buffer | null;
}

function readObjects(pdf: Buffer): Map<number, PdfObject> {
  const objects = new Map<number, PdfObject>();
  const latin = pdf.toString("latin1");
  const head = /(\d+) 0 obj\s*/g;
  let m: RegExpExecArray | null;
  while ((m = head.exec(latin)) !== null) {
    const start = m.index + m[0].length;
    const streamAt = latin.indexOf("stream", start);
    const endAt = latin.indexOf("endobj", start);
    if (endAt < 0) break;
    if (streamAt >= 0 && streamAt < endAt) {
      const dict = latin.slice(start, streamAt);
      const length = /\/Length (\d+)/.exec(dict);
      let dataStart = streamAt + "stream".length;
      if (latin[dataStart] === "\r") dataStart++;
      if (latin[dataStart] === "\n") dataStart++;
      const dataEnd = length ? dataStart + Number(length[1]) : latin.indexOf("endstream", dataStart);
      const raw = pdf.subarray(dataStart, dataEnd);
      const stream = /\/Filter\s*\/FlateDecode/.test(dict) ? inflateSync(raw) : raw;
      objects.set(Number(m[1]), { dict, stream });
      head.lastIndex = latin.indexOf("endobj", dataEnd);
    } else {
      objects.set(Number(m[1]), { dict: latin.slice(start, endAt), stream: null });
      head.lastIndex = endAt;
    }
  }
  return objects;
}

function refs(text: string): number[] {
  return [...text.matchAll(/(\d+) 0 R/g)].map((r) => Number(r[1]));
}

/** The inner text of the `<< … >>` or `[ … ]` that follows `/key`, balanced. */
function entry(dict: string, key: string): string | null {
  const at = dict.search(new RegExp(`/${key}(?![A-Za-z])`));
  if (at < 0) return null;
  let i = at + key.length + 1;
  while (dict[i] === " " || dict[i] === "\n" || dict[i] === "\r") i++;
  const open = dict.startsWith("<<", i) ? "<<" : dict[i] === "[" ? "[" : null;
  if (open === null) return /^(\d+ 0 R|\/\w+|[\d.]+)/.exec(dict.slice(i))?.[0] ?? null;
  const close = open === "<<" ? ">>" : "]";
  let depth = 0;
  for (let j = i; j < dict.length; j++) {
    if (dict.startsWith(open, j)) {
      depth++;
      j += open.length - 1;
    } else if (dict.startsWith(close, j)) {
      depth--;
      if (depth === 0) return dict.slice(i + open.length, j);
      j += close.length - 1;
    }
  }
  throw new Error(`unbalanced /${key} in PDF dictionary`);
}

function hexUnits(hex: string): number[] {
  const clean = hex.replace(/\s+/g, "");
  const out: number[] = [];
  for (let i = 0; i + 4 <= clean.length; i += 4) out.push(parseInt(clean.slice(i, i + 4), 16));
  return out;
}

function unicodeOf(hex: string): string {
  return String.fromCharCode(...hexUnits(hex));
}

/** code → text from a ToUnicode CMap (2-byte codes). */
function toUnicodeMap(cmap: string): Map<number, string> {
  const map = new Map<number, string>();
  for (const block of cmap.matchAll(/beginbfchar([\s\S]*?)endbfchar/g)) {
    for (const pair of block[1]!.matchAll(/<([0-9A-Fa-f]+)>\s*<([0-9A-Fa-f]+)>/g)) {
      map.set(parseInt(pair[1]!, 16), unicodeOf(pair[2]!));
    }
  }
  for (const block of cmap.matchAll(/beginbfrange([\s\S]*?)endbfrange/g)) {
    for (const range of block[1]!.matchAll(/<([0-9A-Fa-f]+)>\s*<([0-9A-Fa-f]+)>\s*(<[0-9A-Fa-f]+>|\[[^\]]*\])/g)) {
      const lo = parseInt(range[1]!, 16);
      const hi = parseInt(range[2]!, 16);
      const target = range[3]!;
      if (target.startsWith("[")) {
        const list = [...target.matchAll(/<([0-9A-Fa-f]+)>/g)].map((t) => unicodeOf(t[1]!));
        for (let c = lo; c <= hi; c++) map.set(c, list[c - lo] ?? "");
      } else {
        const units = hexUnits(target.slice(1, -1));
        for (let c = lo; c <= hi; c++) {
          const last = units.length - 1;
          map.set(c, String.fromCharCode(...units.slice(0, last), units[last]! + (c - lo)));
        }
      }
    }
  }
  return map;
}

export interface PdfPages {
  /** Text of each page in page order; the glyphs of one text object are joined, text objects are separated by "\n". */
  readonly pages: readonly string[];
}

/** Reads the text of every page of a PDF written by Chromium's page.pdf(). */
export function pdfPageTexts(pdf: Buffer): PdfPages {
  if (pdf.subarray(0, 5).toString("latin1") !== "%PDF-") throw new Error("not a PDF");
  const objects = readObjects(pdf);
  const get = (n: number): PdfObject => {
    const o = objects.get(n);
    if (!o) throw new Error(`PDF object ${n} missing`);
    return o;
  };
  const catalog = [...objects.values()].find((o) => /\/Type\s*\/Catalog/.test(o.dict));
  if (!catalog) throw new Error("PDF catalog not found");
  const rootRef = entry(catalog.dict, "Pages");
  if (!rootRef) throw new Error("PDF catalog has no /Pages");

  const pageNumbers: number[] = [];
  const walk = (n: number): void => {
    const node = get(n);
    if (/\/Type\s*\/Pages/.test(node.dict)) for (const kid of refs(entry(node.dict, "Kids") ?? "")) walk(kid);
    else pageNumbers.push(n);
  };
  walk(refs(rootRef)[0]!);

  const fontCache = new Map<number, Map<number, string>>();
  const fontMap = (fontRef: number): Map<number, string> => {
    let map = fontCache.get(fontRef);
    if (!map) {
      const toUnicode = entry(get(fontRef).dict, "ToUnicode");
      const cmap = toUnicode ? get(refs(toUnicode)[0]!).stream : null;
      map = cmap ? toUnicodeMap(cmap.toString("latin1")) : new Map();
      fontCache.set(fontRef, map);
    }
    return map;
  };

  const pages = pageNumbers.map((n) => {
    const page = get(n).dict;
    let resources = entry(page, "Resources") ?? "";
    if (/^\d+ 0 R$/.test(resources)) resources = get(refs(resources)[0]!).dict;
    const fonts = new Map<string, number>();
    const fontDict = entry(resources, "Font") ?? "";
    const fontEntries = /^\d+ 0 R$/.test(fontDict) ? get(refs(fontDict)[0]!).dict : fontDict;
    for (const f of fontEntries.matchAll(/\/([\w.+-]+)\s+(\d+) 0 R/g)) fonts.set(f[1]!, Number(f[2]));
    const contents = refs(entry(page, "Contents") ?? "")
      .map((c) => get(c).stream?.toString("latin1") ?? "")
      .join("\n");

    const blocks: string[] = [];
    for (const bt of contents.matchAll(/\bBT\b([\s\S]*?)\bET\b/g)) {
      let font = new Map<number, string>();
      let text = "";
      // A span with ActualText (Skia writes one around each ligature glyph) stands for its glyphs until EMC.
      let actual = false;
      const ops =
        /\/Span\s*<<\s*\/ActualText\s*\(((?:\\.|[^\\)])*)\)\s*>>\s*BDC|\bEMC\b|\/([\w.+-]+)\s+[\d.]+\s+Tf|<([0-9A-Fa-f\s]*)>\s*Tj|\[([^\]]*)\]\s*TJ/g;
      for (const op of bt[1]!.matchAll(ops)) {
        if (op[1] !== undefined) {
          text += op[1].replace(/\\(.)/g, "$1");
          actual = true;
        } else if (op[0] === "EMC") {
          actual = false;
        } else if (op[2] !== undefined) {
          const ref = fonts.get(op[2]);
          font = ref === undefined ? new Map() : fontMap(ref);
        } else if (!actual) {
          const hex = op[3] ?? [...(op[4] ?? "").matchAll(/<([0-9A-Fa-f\s]*)>/g)].map((h) => h[1]).join("");
          for (const code of hexUnits(hex)) text += font.get(code) ?? "";
        }
      }
      blocks.push(text);
    }
    return blocks.join("\n");
  });
  return { pages };
}

/** Whitespace removed: glyph runs, line breaks and spaces in the PDF need not match the page's. */
export function squeeze(text: string): string {
  return text.replace(/\s+/g, "");
}
