/**
 * The arm files the site was built from, read directly (not through src/catalog) so the tests check the pages
 * against the files themselves. The fingerprint is recomputed here independently: sha256 over the JSON with keys
 * sorted at every level and no whitespace.
 */
import { createHash } from "node:crypto";
import { readdirSync, readFileSync } from "node:fs";
import { join, resolve } from "node:path";

export interface ArmFileJoint {
  readonly name: string;
  readonly kind: "revolute" | "prismatic";
  readonly rangeDeg?: [number, number];
  readonly rangeMm?: [number, number];
  readonly coupling?: { readonly terms: readonly { readonly joint: string; readonly gain: number }[] };
}

export interface ArmFile {
  readonly file: string;
  readonly id: string;
  readonly maker: string;
  readonly model: string;
  readonly joints: readonly ArmFileJoint[];
  readonly source: {
    readonly document: string;
    readonly revision: string;
    readonly date: string;
    readonly notes?: string;
  };
  readonly fingerprint: string;
}

function canonical(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonical).join(",")}]`;
  if (value !== null && typeof value === "object") {
    const obj = value as Record<string, unknown>;
    return `{${Object.keys(obj)
      .sort()
      .map((k) => `${JSON.stringify(k)}:${canonical(obj[k])}`)
      .join(",")}}`;
  }
  return JSON.stringify(value);
}

export function armsDir(root: string): string {
  return resolve(root, process.env.ARMDEX_ARMS_DIR ?? "arms");
}

export function readArmFiles(root: string): ArmFile[] {
  const dir = armsDir(root);
  return readdirSync(dir)
    .filter((f) => f.toLowerCase().endsWith(".json"))
    .sort()
    .map((file) => {
      let text = readFileSync(join(dir, file), "utf8");
      if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
      const data = JSON.parse(text) as Omit<ArmFile, "file" | "fingerprint">;
      return { ...data, file, fingerprint: createHash("sha256").update(canonical(data)).digest("hex").slice(0, 12) };
    });
}

/** Passive: a coupling and no range of its own. */
export function isPassive(joint: ArmFileJoint): boolean {
  return joint.coupling !== undefined && joint.rangeDeg === undefined && joint.rangeMm === undefined;
}
