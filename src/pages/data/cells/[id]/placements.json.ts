// dist/data/cells/<id>/placements.json: one placement map per candidate arm (candidate order), each as
// `armdex place arms/cells/<id>.json --arm <arm>` prints it (50 mm grid, the placement's yaw).
import type { APIRoute, GetStaticPaths } from "astro";
import type { Cell } from "../../../../catalog/cell";
import { cellPageData, cellStaticPaths } from "../../../../catalog/cellPages";
import { stringifyCompact } from "../../../../cli/json";

export const getStaticPaths = cellStaticPaths satisfies GetStaticPaths;

export const GET: APIRoute = async ({ props }) => {
  const { results } = await cellPageData((props as { cell: Cell }).cell);
  return new Response(`${stringifyCompact(results.placements)}\n`, { headers: { "content-type": "application/json" } });
};
