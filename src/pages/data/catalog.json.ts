// dist/data/catalog.json: one summary row per arm (declared and computed key figures).
import type { APIRoute } from "astro";
import { getCatalog } from "../../catalog";
import { getAnalysis } from "../../catalog/analysis";
import { catalogSummaryRow } from "../../view/catalogData";

export const GET: APIRoute = async () => {
  const { arms } = await getCatalog();
  const rows = [];
  for (const arm of arms) rows.push(catalogSummaryRow(arm, await getAnalysis(arm)));
  return new Response(JSON.stringify({ arms: rows }), { headers: { "content-type": "application/json" } });
};
