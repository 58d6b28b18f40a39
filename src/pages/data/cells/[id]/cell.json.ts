// dist/data/cells/<id>/cell.json: the cell file as written in arms/cells/ (the cell editor starts from it).
import type { APIRoute, GetStaticPaths } from "astro";
import type { Cell } from "../../../../catalog/cell";
import { cellFileText, cellStaticPaths } from "../../../../catalog/cellPages";

export const getStaticPaths = cellStaticPaths satisfies GetStaticPaths;

export const GET: APIRoute = async ({ props }) =>
  new Response(await cellFileText((props as { cell: Cell }).cell), { headers: { "content-type": "application/json" } });
