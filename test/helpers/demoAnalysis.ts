/**
 * A demo arm loaded from arms/ with its analysis, as a page would see it (through JSON, as the cache hands it out).
 * For view and cache tests that need a real analysis; the SCARA is the quickest to analyse.
 */
import { loadArmFile, type Arm } from "../../src/catalog";
import { armFacts } from "../../src/catalog/analysis";
import { analyseArm, type ArmAnalysis } from "../../src/core/analysis/analyseArm";

export async function demoArmWithAnalysis(
  file = "arms/yarrowfield-sable-600.json",
): Promise<{ arm: Arm; analysis: ArmAnalysis }> {
  const loaded = await loadArmFile(file);
  if (!loaded.arm) throw new Error(`demo arm did not load: ${JSON.stringify(loaded.issues)}`);
  const analysis = JSON.parse(JSON.stringify(analyseArm(loaded.arm.chain, armFacts(loaded.arm)))) as ArmAnalysis;
  return { arm: loaded.arm, analysis };
}
