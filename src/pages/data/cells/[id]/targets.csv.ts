// dist/data/cells/<id>/targets.csv: every target of every candidate arm (joints in deg, mm for linear axes).
import type { APIRoute, GetStaticPaths } from "astro";
import type { Cell } from "../../../../catalog/cell";
import { cellPageData, cellStaticPaths } from "../../../../catalog/cellPages";
import { targetsCsv } from "../../../../view/cellCsv";
import { drivenJointUnits } from "../../../../view/cellArms";

export const getStaticPaths = cellStaticPaths satisfies GetStaticPaths;

export const GET: APIRoute = async ({ props }) => {
  const { results, arms } = await cellPageData((props as { cell: Cell }).cell);
  const units = new Map(arms.map((arm) => [arm.id, drivenJointUnits(arm)]));
  return new Response(targetsCsv(results.study, units), { headers: { "content-type": "text/csv; charset=utf-8" } });
};
