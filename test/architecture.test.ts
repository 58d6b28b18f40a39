/**
 * Layering guards: the import graph of src/ read from the source text.
 *   - core imports nothing outside core, and no npm package but ml-matrix;
 *   - charts import nothing of the project (d3 modules only);
 *   - catalog imports nothing of view, pages, layouts, components, scripts or cli;
 *   - everything outside core enters it through src/core/index.ts;
 *   - no import cycle anywhere in src/ (type-only imports included);
 *   - no file over 700 lines, no function over 150 (read with the TypeScript compiler's parser).
 * A worker started with `new Worker(new URL(…))` is not an import: the worker imports its parent module.
 * Each rule is also run against a small made-up graph, so a rule that could never fire is caught.
 */
import { readdirSync, readFileSync } from "node:fs";
import { dirname, join, relative, resolve } from "node:path";
import ts from "typescript";
import { describe, expect, it } from "vitest";

const root = resolve(new URL("..", import.meta.url).pathname);
const src = join(root, "src");

function sourceFiles(dir: string): string[] {
  return readdirSync(dir, { recursive: true, encoding: "utf8" })
    .filter((f) => /\.(ts|mjs|astro|mdx)$/.test(f))
    .map((f) => join(dir, f))
    .sort();
}

/** Import specifiers of a source text: static imports and re-exports (type-only included) and dynamic imports. */
export function importSpecifiers(text: string): string[] {
  const out: string[] = [];
  const patterns = [
    /^\s*import\s+(?:type\s+)?(?:[\w*{}\s,$]+?\s+from\s+)?["']([^"']+)["']/gm,
    /^\s*export\s+(?:type\s+)?(?:\*|\{[^}]*\})(?:\s+as\s+\w+)?\s+from\s+["']([^"']+)["']/gm,
    /\bimport\(\s*["']([^"']+)["']\s*\)/g,
  ];
  for (const re of patterns) for (const m of text.matchAll(re)) out.push(m[1]!);
  return out;
}

/** Resolves a relative specifier to a file of `files` (extension and /index optional); null when none matches. */
function resolveRelative(from: string, spec: string, files: ReadonlySet<string>): string | null {
  const base = resolve(dirname(from), spec);
  for (const candidate of [base, `${base}.ts`, `${base}.mjs`, join(base, "index.ts")])
    if (files.has(candidate)) return candidate;
  // "./x.mjs" bootstraps "./x.ts" (the worker); ".js" names its ".ts" source.
  const ts = base.replace(/\.(m?js)$/, ".ts");
  return files.has(ts) ? ts : null;
}

interface Graph {
  /** file → resolved project files it imports */
  readonly edges: ReadonlyMap<string, readonly string[]>;
  /** file → package specifiers it imports */
  readonly packages: ReadonlyMap<string, readonly string[]>;
}

function buildGraph(files: readonly string[], read: (f: string) => string): Graph {
  const set = new Set(files);
  const edges = new Map<string, string[]>();
  const packages = new Map<string, string[]>();
  for (const f of files) {
    const e: string[] = [];
    const p: string[] = [];
    for (const spec of importSpecifiers(read(f))) {
      if (spec.startsWith(".")) {
        const target = resolveRelative(f, spec, set);
        if (target) e.push(target);
      } else p.push(spec);
    }
    edges.set(f, e);
    packages.set(f, p);
  }
  return { edges, packages };
}

const layer = (file: string) => relative(src, file).split("/")[0]!;

/** Every rule violation of a graph over files under `srcDir`, as "a → b: rule" lines. */
function violations(graph: Graph, srcDir: string): string[] {
  const out: string[] = [];
  const rel = (f: string) => relative(srcDir, f);
  const layerOf = (f: string) => rel(f).split("/")[0]!;
  for (const [file, targets] of graph.edges) {
    const from = layerOf(file);
    for (const t of targets) {
      const to = layerOf(t);
      if (from === "core" && to !== "core") out.push(`${rel(file)} → ${rel(t)}: core imports only core`);
      if (from === "charts" && to !== "charts")
        out.push(`${rel(file)} → ${rel(t)}: charts import nothing of the project`);
      if (from === "catalog" && ["view", "pages", "layouts", "components", "scripts", "cli", "charts"].includes(to))
        out.push(`${rel(file)} → ${rel(t)}: catalog imports no view, page or CLI code`);
      if (from !== "core" && to === "core" && rel(t) !== "core/index.ts")
        out.push(`${rel(file)} → ${rel(t)}: outside core, import the core through core/index.ts`);
    }
  }
  for (const [file, specs] of graph.packages) {
    const from = layerOf(file);
    for (const s of specs) {
      if (from === "core" && s !== "ml-matrix") out.push(`${rel(file)} → ${s}: core uses no package but ml-matrix`);
      if (from === "charts" && !/^d3(-[a-z]+)?$/.test(s)) out.push(`${rel(file)} → ${s}: charts use d3 only`);
    }
  }
  for (const cycle of cycles(graph.edges)) out.push(`cycle: ${cycle.map(rel).join(" → ")}`);
  return out;
}

/** Strongly connected components with more than one file (or a file importing itself): Tarjan's algorithm. */
function cycles(edges: ReadonlyMap<string, readonly string[]>): string[][] {
  let index = 0;
  const idx = new Map<string, number>(),
    low = new Map<string, number>(),
    stack: string[] = [],
    on = new Set<string>(),
    out: string[][] = [];
  const visit = (v: string) => {
    idx.set(v, index);
    low.set(v, index++);
    stack.push(v);
    on.add(v);
    for (const w of edges.get(v) ?? []) {
      if (!idx.has(w)) {
        visit(w);
        low.set(v, Math.min(low.get(v)!, low.get(w)!));
      } else if (on.has(w)) low.set(v, Math.min(low.get(v)!, idx.get(w)!));
    }
    if (low.get(v) === idx.get(v)) {
      const scc: string[] = [];
      let w: string;
      do {
        w = stack.pop()!;
        on.delete(w);
        scc.push(w);
      } while (w !== v);
      if (scc.length > 1 || (edges.get(v) ?? []).includes(v)) out.push(scc.sort());
    }
  };
  for (const v of edges.keys()) if (!idx.has(v)) visit(v);
  return out;
}

describe("layering of src/", () => {
  const files = sourceFiles(src);
  const graph = buildGraph(files, (f) => readFileSync(f, "utf8"));

  it("reads the imports of every source file", () => {
    // Sanity: the parser finds the core's way in and a known edge (catalog → core), so an empty graph cannot pass.
    const catalogLoad = join(src, "catalog", "load.ts");
    expect(graph.edges.get(catalogLoad)).toContain(join(src, "core", "index.ts"));
    expect(files.filter((f) => layer(f) === "core").length).toBeGreaterThan(20);
  });

  it("keeps every layer rule and has no import cycle", () => {
    expect(violations(graph, src)).toEqual([]);
  });

  it("has no source file over 700 lines", () => {
    const long = files
      .map((f) => ({ f: relative(root, f), lines: readFileSync(f, "utf8").split("\n").length }))
      .filter((x) => x.lines > 700);
    expect(long).toEqual([]);
  });
});

/** Functions, methods and arrow functions longer than `maxLines` lines in a TypeScript text, as "name (n lines)". */
function longFunctions(fileName: string, text: string, maxLines: number): string[] {
  const sf = ts.createSourceFile(fileName, text, ts.ScriptTarget.Latest, true);
  const out: string[] = [];
  const visit = (node: ts.Node) => {
    if (ts.isFunctionLike(node) && "body" in node && node.body) {
      const first = sf.getLineAndCharacterOfPosition(node.getStart(sf)).line;
      const last = sf.getLineAndCharacterOfPosition(node.end).line;
      const lines = last - first + 1;
      if (lines > maxLines) {
        const named = node as ts.Node & { name?: ts.Node };
        const name = named.name ? named.name.getText(sf) : `(anonymous at line ${first + 1})`;
        out.push(`${name} (${lines} lines)`);
      }
    }
    ts.forEachChild(node, visit);
  };
  visit(sf);
  return out;
}

describe("function length", () => {
  it("has no function over 150 lines in src/", () => {
    const long = sourceFiles(src)
      .filter((f) => f.endsWith(".ts"))
      .flatMap((f) => longFunctions(f, readFileSync(f, "utf8"), 150).map((x) => `${relative(root, f)}: ${x}`));
    expect(long).toEqual([]);
  });

  it("finds a long function in a made-up text", () => {
    const body = Array.from({ length: 160 }, (_, i) => `  const a${i} = ${i};`).join("\n");
    expect(longFunctions("x.ts", `export function big() {\n${body}\n}\nconst small = () => 1;\n`, 150)).toEqual([
      "big (162 lines)",
    ]);
  });
});

describe("the layer rules fire on a made-up graph", () => {
  const fake = "/p/src";
  const text: Record<string, string> = {
    [`${fake}/core/index.ts`]: 'export * from "./a";',
    [`${fake}/core/a.ts`]: 'import { x } from "../view/v";\nimport d3 from "d3-scale";',
    [`${fake}/core/b.ts`]: 'import type { C } from "./c";',
    [`${fake}/core/c.ts`]: 'import { B } from "./b";',
    [`${fake}/charts/k.ts`]: 'import type { A } from "../core";',
    [`${fake}/catalog/l.ts`]: 'import { v } from "../view/v";\nimport { a } from "../core/a";',
    [`${fake}/view/v.ts`]: 'const m = await import("../core/index");',
  };
  const graph = buildGraph(Object.keys(text), (f) => text[f]!);
  const found = violations(graph, fake);

  it("names each broken rule", () => {
    expect(found).toEqual(
      expect.arrayContaining([
        "core/a.ts → view/v.ts: core imports only core",
        "core/a.ts → d3-scale: core uses no package but ml-matrix",
        "charts/k.ts → core/index.ts: charts import nothing of the project",
        "catalog/l.ts → view/v.ts: catalog imports no view, page or CLI code",
        "catalog/l.ts → core/a.ts: outside core, import the core through core/index.ts",
        "cycle: core/b.ts → core/c.ts",
      ]),
    );
    // The dynamic import of core/index from view is allowed.
    expect(found.filter((l) => l.startsWith("view/"))).toEqual([]);
  });
});
