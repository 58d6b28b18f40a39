// dist/data/arms/<id>/spec.json: the arm's validated description (the arm file as the catalog parsed it). The
// straight-line check on the arm sheet and the comparison page fetches it and compiles the chain in the browser.
import type { APIRoute, GetStaticPaths } from "astro";
import { armStaticPaths, type Arm } from "../../../../catalog";

export const getStaticPaths = armStaticPaths satisfies GetStaticPaths;

export const GET: APIRoute = ({ props }) =>
  new Response(JSON.stringify((props as { arm: Arm }).arm.spec), { headers: { "content-type": "application/json" } });
