// dist/data/cells/<id>/moves.csv: every move of every candidate arm.
import type { APIRoute, GetStaticPaths } from "astro";
import type { Cell } from "../../../../catalog/cell";
import { cellPageData, cellStaticPaths } from "../../../../catalog/cellPages";
import { movesCsv } from "../../../../view/cellCsv";

export const getStaticPaths = cellStaticPaths satisfies GetStaticPaths;

export const GET: APIRoute = async ({ props }) => {
  const { results } = await cellPageData((props as { cell: Cell }).cell);
  return new Response(movesCsv(results.study), { headers: { "content-type": "text/csv; charset=utf-8" } });
};
