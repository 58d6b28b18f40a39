/**
 * Writes the workspace envelope of every arm of a catalog folder as JSON, one file per arm, to compare the output
 * of two versions of the envelope code byte for byte. Usage: tsx test/bench/envelopeDump.ts <outDir> [armsDir]
 */
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { loadArms } from "../../src/catalog";
import { workspaceEnvelope } from "../../src/core/analysis/envelope/envelope";

const [outDir, armsDir = "arms"] = process.argv.slice(2);
if (!outDir) throw new Error("usage: envelopeDump.ts <outDir> [armsDir]");
mkdirSync(outDir, { recursive: true });
const { arms } = await loadArms([armsDir]);
for (const arm of arms) writeFileSync(join(outDir, `${arm.id}.json`), JSON.stringify(workspaceEnvelope(arm.chain)));
console.log(`${arms.length} envelopes written to ${outDir}`);
