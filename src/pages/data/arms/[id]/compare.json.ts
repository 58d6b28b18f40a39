// dist/data/arms/<id>/compare.json: the arm's summary for the side-by-side page (envelopes, payload rows, speed
// figures and compact speed maps, declared fields): a few kilobytes instead of the full analysis.
import type { APIRoute, GetStaticPaths } from "astro";
import { armStaticPaths, type Arm } from "../../../../catalog";
import { getAnalysis } from "../../../../catalog/analysis";
import { compareSummary } from "../../../../view/compareData";

export const getStaticPaths = armStaticPaths satisfies GetStaticPaths;

export const GET: APIRoute = async ({ props }) => {
  const arm = (props as { arm: Arm }).arm;
  return new Response(JSON.stringify(compareSummary(arm, await getAnalysis(arm))), {
    headers: { "content-type": "application/json" },
  });
};
