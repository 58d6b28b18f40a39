// dist/data/arms/<id>/arm.urdf: the arm's kinematic chain as URDF (SI units, links without meshes; see
// src/catalog/urdf/export.ts), for other tools that read robot descriptions.
import type { APIRoute, GetStaticPaths } from "astro";
import { armStaticPaths, type Arm } from "../../../../catalog";
import { exportUrdf } from "../../../../catalog/urdf";

export const getStaticPaths = armStaticPaths satisfies GetStaticPaths;

export const GET: APIRoute = ({ props }) => {
  const arm = (props as { arm: Arm }).arm;
  return new Response(exportUrdf(arm.spec, arm.chain), {
    headers: { "content-type": "application/xml; charset=utf-8" },
  });
};
