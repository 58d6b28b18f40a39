// dist/data/cells/<id>.json: the cell study, exactly as `armdex cell arms/cells/<id>.json` prints it.
import type { APIRoute, GetStaticPaths } from "astro";
import type { Cell } from "../../../catalog/cell";
import { cellPageData, cellStaticPaths } from "../../../catalog/cellPages";
import { stringifyCompact } from "../../../cli/json";

export const getStaticPaths = cellStaticPaths satisfies GetStaticPaths;

export const GET: APIRoute = async ({ props }) => {
  const { results } = await cellPageData((props as { cell: Cell }).cell);
  return new Response(`${stringifyCompact(results.study)}\n`, { headers: { "content-type": "application/json" } });
};
