// dist/data/arms/<id>/payload.csv: payload at reach for every mounting, reach and CG offset (from the analysis).
import type { APIRoute, GetStaticPaths } from "astro";
import { getCatalog, type Arm } from "../../../../catalog";
import { getAnalysis } from "../../../../catalog/analysis";
import { payloadCsv } from "../../../../view/armCsv";

export const getStaticPaths = (async () => {
  const { arms } = await getCatalog();
  return arms.map((arm) => ({ params: { id: arm.id }, props: { arm } }));
}) satisfies GetStaticPaths;

export const GET: APIRoute = async ({ props }) => {
  const analysis = await getAnalysis((props as { arm: Arm }).arm);
  return new Response(payloadCsv(analysis), { headers: { "content-type": "text/csv; charset=utf-8" } });
};
