// dist/data/arms/<id>.json: the arm's full analysis (the same JSON `armdex analyze` prints). The cache entry is that
// JSON already: it is copied as it is, not parsed and written again.
import type { APIRoute, GetStaticPaths } from "astro";
import { armStaticPaths, type Arm } from "../../../catalog";
import { getAnalysis, readCachedAnalysisText } from "../../../catalog/analysis";

export const getStaticPaths = armStaticPaths satisfies GetStaticPaths;

export const GET: APIRoute = async ({ props }) => {
  const arm = (props as { arm: Arm }).arm;
  const text = (await readCachedAnalysisText(arm)) ?? JSON.stringify(await getAnalysis(arm));
  return new Response(text, { headers: { "content-type": "application/json" } });
};
