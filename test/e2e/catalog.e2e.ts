/**
 * The catalog page with its script, in a real browser: sorting by a numeric and a text column, each filter, the
 * state in the address (and a reload or a fresh visit restoring it), bad address values ignored, the tick boxes and
 * "Open side by side", and the page without JavaScript. Every expected order and set is computed here from the arm
 * files themselves and from the published analyses (dist/data/arms/<id>.json, fetched from the served site), not
 * from the page's own model or filter code. Screenshots go to test-results/screenshots/.
 */
import { mkdirSync, readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { armsDir } from "./helpers/armFiles";
import { collectProblems, launchChromium, watchPage, type PageProblems } from "./helpers/browser";

const root = new URL("../..", import.meta.url).pathname;
const siteUrl = inject("siteUrl");
const origin = inject("origin");
const basePath = inject("basePath");
const shotsDir = join(root, "test-results", "screenshots");

/** The fields of an arm file this test needs, read directly from arms/. */
interface ArmFacts {
  readonly id: string;
  readonly maker: string;
  readonly model: string;
  readonly class: string;
  readonly mountings: readonly string[];
  readonly ratedPayloadKg: number;
  readonly reachMm?: number;
}

/** The fields of a published analysis this test needs. */
interface PublishedAnalysis {
  readonly reach: {
    readonly wcpMaxMm: number | null;
    readonly flangeMaxMm: number | null;
    readonly minHeightMm: number | null;
    readonly maxHeightMm: number | null;
  };
  readonly speed: {
    readonly maps: readonly { readonly orientation: string; readonly maxGuaranteedMmPerS: number | null }[];
  };
  readonly capability: { readonly areaShareAtLeastHalf: number | null } | null;
}

interface Arm extends ArmFacts {
  readonly analysis: PublishedAnalysis;
}

let arms: Arm[];
let browser: Browser;
let desktop: BrowserContext;

beforeAll(async () => {
  mkdirSync(shotsDir, { recursive: true });
  const dir = armsDir(root);
  const facts = readdirSync(dir)
    .filter((f) => f.endsWith(".json"))
    .sort()
    .map((f) => JSON.parse(readFileSync(join(dir, f), "utf8").replace(/^\uFEFF/, "")) as ArmFacts);
  arms = [];
  for (const a of facts) {
    const res = await fetch(`${siteUrl}data/arms/${a.id}.json`);
    expect(res.status, `analysis of ${a.id}`).toBe(200);
    arms.push({ ...a, analysis: (await res.json()) as PublishedAnalysis });
  }
  browser = await launchChromium();
  desktop = await browser.newContext({ viewport: { width: 1280, height: 900 } });
});

afterAll(async () => {
  await desktop?.close();
  await browser?.close();
});

// --- Independent figures and rules -------------------------------------------------------------------------------

const computedReachMm = (a: Arm) => a.analysis.reach.wcpMaxMm ?? a.analysis.reach.flangeMaxMm;
const lineSpeedMPerS = (a: Arm) => {
  const v = a.analysis.speed.maps.find((m) => m.orientation === "down")?.maxGuaranteedMmPerS;
  return v === null || v === undefined ? null : v / 1000;
};
/** Catalog order: by id (file name). */
const byId = (a: Arm, b: Arm) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0);
const ids = (list: readonly Arm[]) => list.map((a) => a.id);
/** The middle of the distinct values: a threshold that keeps some arms and hides others. */
function middle(values: readonly (number | null)[]): number {
  const v = [...new Set(values.filter((x): x is number => x !== null))].sort((a, b) => a - b);
  expect(v.length, "distinct values to pick a threshold from").toBeGreaterThanOrEqual(2);
  return v[Math.floor(v.length / 2)]!;
}

/** Sorted by a number, missing values last in both directions, ties in catalog order. */
function expectedNumericOrder(value: (a: Arm) => number | null | undefined, dir: "asc" | "desc"): string[] {
  const s = dir === "asc" ? 1 : -1;
  return ids(
    [...arms].sort((a, b) => {
      const va = value(a) ?? null,
        vb = value(b) ?? null;
      if (va === null || vb === null) return va === vb ? byId(a, b) : va === null ? 1 : -1;
      return s * (va - vb) || byId(a, b);
    }),
  );
}

// --- Page helpers -----------------------------------------------------------------------------------------------

interface Opened {
  readonly page: Page;
  readonly problems: PageProblems;
  finish(): Promise<string[]>;
}

async function open(query = "", javaScriptEnabled = true): Promise<Opened> {
  const context = javaScriptEnabled
    ? desktop
    : await browser.newContext({ viewport: { width: 1280, height: 900 }, javaScriptEnabled: false });
  const page = await context.newPage();
  const problems = await watchPage(page, origin);
  const response = await page.goto(`${siteUrl}${query}`, { waitUntil: "load" });
  expect(response?.status()).toBe(200);
  if (javaScriptEnabled) await page.locator("#catalog-app.is-live").waitFor();
  return {
    page,
    problems,
    async finish() {
      const list = javaScriptEnabled
        ? await collectProblems(page, problems)
        : [...problems.consoleErrors, ...problems.failedRequests];
      await page.close();
      if (!javaScriptEnabled) await context.close();
      return list;
    },
  };
}

const visibleRows = (page: Page) =>
  page.$$eval("#catalog tbody tr", (rows) =>
    rows
      .filter((r) => !(r as HTMLElement).hidden && (r as HTMLElement).offsetParent !== null)
      .map((r) => (r as HTMLElement).dataset.key ?? ""),
  );
const allRows = (page: Page) =>
  page.$$eval("#catalog tbody tr", (rows) => rows.map((r) => (r as HTMLElement).dataset.key ?? ""));
const query = (page: Page) => new URL(page.url()).searchParams;
const countText = async (page: Page) => ((await page.locator("#catalog-count").textContent()) ?? "").trim();

async function clickSort(page: Page, key: string): Promise<void> {
  await page.locator(`#catalog thead th[data-key="${key}"] button`).click();
}

describe("catalog sorting", () => {
  it("sorts by rated payload (numeric) both ways, with aria-sort and the order in the address", async () => {
    const { page, finish } = await open();
    expect(await allRows(page)).toEqual(ids([...arms].sort(byId)));
    // The heading's button is named by the heading alone (the arrow is decoration).
    await page.getByRole("button", { name: "Rated payload (kg)", exact: true }).click();
    expect(await allRows(page)).toEqual(expectedNumericOrder((a) => a.ratedPayloadKg, "asc"));
    expect(await page.locator('#catalog thead th[data-key="payload"]').getAttribute("aria-sort")).toBe("ascending");
    expect(await page.locator("#catalog thead th[aria-sort]").count()).toBe(1);
    expect(query(page).get("sort")).toBe("payload");
    expect(query(page).get("dir")).toBe("asc");
    await clickSort(page, "payload");
    expect(await allRows(page)).toEqual(expectedNumericOrder((a) => a.ratedPayloadKg, "desc"));
    expect(await page.locator('#catalog thead th[data-key="payload"]').getAttribute("aria-sort")).toBe("descending");
    expect(query(page).get("dir")).toBe("desc");
    expect(await finish()).toEqual([]);
  });

  it("puts 'not stated' last in both directions (stated reach), and sorts computed line speed and tool-direction share by number", async () => {
    expect(
      arms.some((a) => a.reachMm === undefined),
      "an arm file without a stated reach",
    ).toBe(true);
    const { page, finish } = await open();
    await clickSort(page, "reach");
    const asc = await allRows(page);
    expect(asc).toEqual(expectedNumericOrder((a) => a.reachMm, "asc"));
    await clickSort(page, "reach");
    const desc = await allRows(page);
    expect(desc).toEqual(expectedNumericOrder((a) => a.reachMm, "desc"));
    const notStated = ids(arms.filter((a) => a.reachMm === undefined));
    expect(asc.slice(-notStated.length)).toEqual(notStated);
    expect(desc.slice(-notStated.length)).toEqual(notStated);
    await clickSort(page, "line-speed");
    expect(await allRows(page)).toEqual(expectedNumericOrder(lineSpeedMPerS, "asc"));
    // The tool-directions share: arms without a map ("no map") last.
    await clickSort(page, "directions-half");
    expect(await allRows(page)).toEqual(
      expectedNumericOrder((a) => a.analysis.capability?.areaShareAtLeastHalf ?? null, "asc"),
    );
    expect(await finish()).toEqual([]);
  });

  it("sorts by maker (text) both ways, case-insensitive, ties in catalog order", async () => {
    const collator = new Intl.Collator("en", { sensitivity: "base", numeric: true });
    const expected = (s: 1 | -1) => ids([...arms].sort((a, b) => s * collator.compare(a.maker, b.maker) || byId(a, b)));
    const { page, finish } = await open();
    await clickSort(page, "maker");
    expect(await allRows(page)).toEqual(expected(1));
    await clickSort(page, "maker");
    expect(await allRows(page)).toEqual(expected(-1));
    await page.screenshot({ path: join(shotsDir, "catalog-sorted.png"), fullPage: true });
    expect(await finish()).toEqual([]);
  });
});

describe("catalog filters", () => {
  async function expectShown(page: Page, expected: readonly Arm[], what: string): Promise<void> {
    const want = ids(expected).sort();
    expect(want.length, `${what}: keeps at least one arm`).toBeGreaterThan(0);
    expect(want.length, `${what}: hides at least one arm`).toBeLessThan(arms.length);
    await expect.poll(async () => (await visibleRows(page)).sort(), { message: what }).toEqual(want);
    expect(await countText(page)).toBe(`${want.length} of ${arms.length} arms shown`);
    expect(await page.locator("#catalog-empty").isVisible()).toBe(false);
  }

  it("class and mounting", async () => {
    const { page, finish } = await open();
    const cls = arms.map((a) => a.class).sort()[0]!;
    await page.selectOption('select[name="class"]', cls);
    await expectShown(
      page,
      arms.filter((a) => a.class === cls),
      `class ${cls}`,
    );
    expect(query(page).get("class")).toBe(cls);
    await page.selectOption('select[name="class"]', "");
    // A mounting not every arm offers.
    const mounting = ["ceiling", "wall", "angled", "floor"].find(
      (m) => arms.some((a) => a.mountings.includes(m)) && !arms.every((a) => a.mountings.includes(m)),
    )!;
    await page.selectOption('select[name="mounting"]', mounting);
    await expectShown(
      page,
      arms.filter((a) => a.mountings.includes(mounting)),
      `mounting ${mounting}`,
    );
    expect(query(page).get("mounting")).toBe(mounting);
    expect(query(page).has("class")).toBe(false);
    expect(await finish()).toEqual([]);
  });

  it("minimum payload, minimum computed reach and minimum line speed", async () => {
    const { page, finish } = await open();
    const payload = middle(arms.map((a) => a.ratedPayloadKg));
    await page.fill('input[name="minPayloadKg"]', String(payload));
    await expectShown(
      page,
      arms.filter((a) => a.ratedPayloadKg >= payload),
      `payload ≥ ${payload} kg`,
    );
    expect(Number(query(page).get("minPayloadKg"))).toBe(Number(payload.toPrecision(12)));
    await page.fill('input[name="minPayloadKg"]', "");

    const reach = middle(arms.map(computedReachMm));
    await page.fill('input[name="minReachMm"]', String(reach));
    await expectShown(
      page,
      arms.filter((a) => (computedReachMm(a) ?? -1) >= reach),
      `computed reach ≥ ${reach} mm`,
    );
    expect(Number(query(page).get("minReachMm"))).toBe(Number(reach.toPrecision(12)));
    await page.fill('input[name="minReachMm"]', "");

    const speed = middle(arms.map(lineSpeedMPerS));
    await page.fill('input[name="minLineSpeedMPerS"]', String(speed));
    await expectShown(
      page,
      arms.filter((a) => (lineSpeedMPerS(a) ?? -1) >= speed),
      `line speed ≥ ${speed} m/s`,
    );
    // The address keeps 12 significant digits (catalogFilter.ts), so 1.7455999999999998 reads back as 1.7456.
    expect(Number(query(page).get("minLineSpeedMPerS"))).toBe(Number(speed.toPrecision(12)));
    expect(query(page).has("minPayloadKg")).toBe(false);
    await page.screenshot({ path: join(shotsDir, "catalog-filtered.png"), fullPage: true });
    expect(await finish()).toEqual([]);
  });

  it("height band: the computed height range must cover it", async () => {
    const lows = arms.map((a) => a.analysis.reach.minHeightMm!).sort((a, b) => a - b);
    const highs = arms.map((a) => a.analysis.reach.maxHeightMm!).sort((a, b) => a - b);
    // A band from the middle lowest height to the middle highest height: some arms cover it, some do not.
    const from = Math.round(lows[Math.floor(lows.length / 2)]!);
    const to = Math.round(highs[Math.floor(highs.length / 2)]!);
    const covers = (a: Arm) =>
      a.analysis.reach.minHeightMm! <= Math.min(from, to) && a.analysis.reach.maxHeightMm! >= Math.max(from, to);
    const { page, finish } = await open();
    await page.fill('input[name="heightFromMm"]', String(from));
    await page.fill('input[name="heightToMm"]', String(to));
    await expectShown(page, arms.filter(covers), `heights ${from} to ${to} mm`);
    expect(Number(query(page).get("heightFromMm"))).toBe(from);
    expect(Number(query(page).get("heightToMm"))).toBe(to);
    expect(await finish()).toEqual([]);
  });

  it("says so when no arm matches, and clears", async () => {
    const { page, finish } = await open();
    const tooHeavy = Math.max(...arms.map((a) => a.ratedPayloadKg)) + 1;
    await page.fill('input[name="minPayloadKg"]', String(tooHeavy));
    await expect.poll(() => visibleRows(page)).toEqual([]);
    expect(await countText(page)).toBe(`0 of ${arms.length} arms shown`);
    expect(await page.locator("#catalog-empty").isVisible()).toBe(true);
    expect(await page.locator("#catalog-empty").textContent()).toContain("No arm matches");
    expect(await page.locator("#catalog-count").getAttribute("aria-live")).toBe("polite");
    await page.screenshot({ path: join(shotsDir, "catalog-no-match.png"), fullPage: true });
    await page.locator("#catalog-empty button").click();
    expect((await visibleRows(page)).length).toBe(arms.length);
    expect(await page.inputValue('input[name="minPayloadKg"]')).toBe("");
    expect(query(page).has("minPayloadKg")).toBe(false);
    expect(await finish()).toEqual([]);
  });
});

describe("catalog state in the address", () => {
  it("a reload and a fresh visit of the address restore filters, order and ticks", async () => {
    const { page, finish } = await open();
    const mounting = "floor";
    const payload = middle(arms.filter((a) => a.mountings.includes(mounting)).map((a) => a.ratedPayloadKg));
    await page.selectOption('select[name="mounting"]', mounting);
    await page.fill('input[name="minPayloadKg"]', String(payload));
    await clickSort(page, "mass");
    await clickSort(page, "mass");
    const before = await visibleRows(page);
    const ticked = before.slice(0, 2);
    expect(ticked).toHaveLength(2);
    for (const id of ticked) await page.locator(`#catalog tbody tr[data-key="${id}"] input[type="checkbox"]`).check();
    const q = query(page);
    expect(q.get("mounting")).toBe(mounting);
    expect(Number(q.get("minPayloadKg"))).toBe(payload);
    expect(q.get("sort")).toBe("mass");
    expect(q.get("dir")).toBe("desc");
    expect(q.get("pick")).toBe(ticked.join(","));
    expect(new URL(page.url()).search).toContain(`pick=${ticked.join(",")}`); // commas stay readable

    const address = page.url();
    const check = async (p: Page) => {
      expect(await visibleRows(p)).toEqual(before);
      expect(await p.inputValue('select[name="mounting"]')).toBe(mounting);
      expect(Number(await p.inputValue('input[name="minPayloadKg"]'))).toBe(payload);
      expect(await p.locator('#catalog thead th[data-key="mass"]').getAttribute("aria-sort")).toBe("descending");
      const checked = await p.$$eval("#catalog tbody input[type=checkbox]:checked", (els) =>
        els.map((e) => (e as HTMLInputElement).value),
      );
      expect(checked.sort()).toEqual([...ticked].sort());
      expect(p.url()).toBe(address);
    };
    await page.reload();
    await page.locator("#catalog-app.is-live").waitFor();
    await check(page);
    expect(await finish()).toEqual([]);

    const fresh = await open(new URL(address).search);
    await check(fresh.page);
    expect(await fresh.finish()).toEqual([]);
  });

  it("ignores bad values in the address instead of failing", async () => {
    const { page, finish } = await open(
      "?class=spaceship&mounting=roof&minPayloadKg=abc&minReachMm=-5&heightFromMm=1e9&minLineSpeedMPerS=&sort=colour&dir=up&pick=nope,,%3Cb%3E",
    );
    expect((await visibleRows(page)).length).toBe(arms.length);
    expect(await countText(page)).toBe(`${arms.length} of ${arms.length} arms shown`);
    expect(await page.locator("#catalog thead th[aria-sort]").count()).toBe(0);
    expect(await page.locator("#catalog tbody input:checked").count()).toBe(0);
    expect(new URL(page.url()).search).toBe("");
    expect(await finish()).toEqual([]);
  });
});

describe("catalog ticks", () => {
  it("the button needs 2 to 6 ticks and opens compare/?arms=<the ticked ids> under the base path", async () => {
    const { page, problems } = await open();
    const button = page.getByRole("button", { name: "Open side by side" });
    expect(await button.isDisabled()).toBe(true);
    const chosen = [arms[arms.length - 1]!, arms[0]!, arms[Math.floor(arms.length / 2)]!].map((a) => a.id);
    const tick = (id: string) => page.locator(`#catalog tbody tr[data-key="${id}"] input[type="checkbox"]`);
    await tick(chosen[0]!).check();
    expect(await button.isDisabled()).toBe(true);
    expect(await page.locator("#compare-reason").textContent()).toMatch(/at least one more/);
    if (arms.length >= 7) {
      const rest = ids(arms)
        .filter((id) => !chosen.includes(id))
        .slice(0, 6);
      for (const id of rest) await tick(id).check();
      expect(await button.isDisabled()).toBe(true);
      expect(await page.locator("#compare-reason").textContent()).toMatch(/^Untick 1 arm/);
      for (const id of rest) await tick(id).uncheck();
    }
    await tick(chosen[1]!).check();
    await tick(chosen[2]!).check();
    expect(await button.isDisabled()).toBe(false);
    expect(query(page).get("pick")).toBe(chosen.join(","));
    await page.screenshot({ path: join(shotsDir, "catalog-ticks.png"), fullPage: true });
    const seen = await collectProblems(page, problems);
    expect(seen).toEqual([]);
    await button.click();
    await page.waitForURL((url) => url.pathname.endsWith("/compare/"));
    const url = new URL(page.url());
    expect(url.origin).toBe(origin);
    expect(url.pathname).toBe(`${basePath}compare/`);
    expect(url.searchParams.get("arms")).toBe(chosen.join(","));
    await page.close();
  });
});

describe("catalog without JavaScript", () => {
  it("is the plain table: every row, no filter form, no tick column", async () => {
    const { page, finish } = await open("?class=scara", false);
    expect((await visibleRows(page)).sort()).toEqual(ids(arms).sort());
    expect(await page.locator("#catalog-filters").isVisible()).toBe(false);
    expect(await page.locator(".catalog-status").isVisible()).toBe(false);
    expect(await page.locator("#catalog .pick-col").first().isVisible()).toBe(false);
    expect(await page.locator("#catalog thead button").count()).toBe(0);
    expect(await finish()).toEqual([]);
  });
});

describe("catalog on a narrow screen", () => {
  it("fits with the controls: only the table scrolls sideways", async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    const problems = await watchPage(page, origin);
    await page.goto(`${siteUrl}?pick=${arms[0]!.id}`);
    await page.locator("#catalog-app.is-live").waitFor();
    expect(await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth)).toBeLessThanOrEqual(1);
    await page.screenshot({ path: join(shotsDir, "catalog-narrow-live.png"), fullPage: true });
    expect(await collectProblems(page, problems)).toEqual([]);
    await context.close();
  });
});
