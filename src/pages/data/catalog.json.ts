// dist/data/catalog.json: one summary row per arm (declared and computed key figures), from the analyses' summaries.
import type { APIRoute } from "astro";
import { getCatalog } from "../../catalog";
import { getAnalysisSummary } from "../../catalog/analysis";
import { catalogSummaryRow } from "../../view/catalogData";

export const GET: APIRoute = async () => {
  const { arms } = await getCatalog();
  const rows = [];
  for (const arm of arms) rows.push(catalogSummaryRow(arm, await getAnalysisSummary(arm)));
  return new Response(JSON.stringify({ arms: rows }), { headers: { "content-type": "application/json" } });
};
