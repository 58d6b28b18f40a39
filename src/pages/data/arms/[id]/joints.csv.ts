// dist/data/arms/<id>/joints.csv: the joint table as declared in the arm file.
import type { APIRoute, GetStaticPaths } from "astro";
import { armStaticPaths, type Arm } from "../../../../catalog";
import { jointsCsv } from "../../../../view/armCsv";

export const getStaticPaths = armStaticPaths satisfies GetStaticPaths;

export const GET: APIRoute = ({ props }) =>
  new Response(jointsCsv((props as { arm: Arm }).arm), { headers: { "content-type": "text/csv; charset=utf-8" } });
