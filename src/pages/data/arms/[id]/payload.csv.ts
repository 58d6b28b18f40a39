// dist/data/arms/<id>/payload.csv: payload at reach for every mounting, reach and CG offset (from the analysis;
// cached beside it, see src/catalog/derived.ts).
import type { APIRoute, GetStaticPaths } from "astro";
import { armStaticPaths, type Arm } from "../../../../catalog";
import { getAnalysis } from "../../../../catalog/analysis";
import { cachedDerived } from "../../../../catalog/derived";
import { payloadCsv } from "../../../../view/armCsv";

export const getStaticPaths = armStaticPaths satisfies GetStaticPaths;

export const GET: APIRoute = async ({ props }) => {
  const arm = (props as { arm: Arm }).arm;
  const csv = await cachedDerived(arm, "payload-csv", {}, async () => payloadCsv(await getAnalysis(arm)));
  return new Response(csv, { headers: { "content-type": "text/csv; charset=utf-8" } });
};
