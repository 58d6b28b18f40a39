// dist/data/arms/<id>/revisions.json: the arm file's pinned revisions, newest first:
// [{ fingerprint, commit | null, date | null, sourceRevision, changed: [{ path, from, to }] }].
import type { APIRoute, GetStaticPaths } from "astro";
import { armStaticPaths, type Arm } from "../../../../catalog";
import { readRevisionData } from "../../../../catalog/revisions";
import { revisionsJson } from "../../../../view/revisionModel";

export const getStaticPaths = armStaticPaths satisfies GetStaticPaths;

export const GET: APIRoute = async ({ props }) => {
  const arm = (props as { arm: Arm }).arm;
  return new Response(`${JSON.stringify(revisionsJson(await readRevisionData(arm)), null, 2)}\n`, {
    headers: { "content-type": "application/json" },
  });
};
