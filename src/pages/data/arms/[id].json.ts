// dist/data/arms/<id>.json: the arm's full analysis (the same JSON `armdex analyze` prints).
import type { APIRoute, GetStaticPaths } from "astro";
import { getCatalog } from "../../../catalog";
import { getAnalysis } from "../../../catalog/analysis";

export const getStaticPaths = (async () => {
  const { arms } = await getCatalog();
  return arms.map((arm) => ({ params: { id: arm.id }, props: { arm } }));
}) satisfies GetStaticPaths;

export const GET: APIRoute = async ({ props }) => {
  const analysis = await getAnalysis((props as { arm: Parameters<typeof getAnalysis>[0] }).arm);
  return new Response(JSON.stringify(analysis), { headers: { "content-type": "application/json" } });
};
