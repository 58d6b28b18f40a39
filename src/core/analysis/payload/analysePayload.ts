/**
 * The payload section of an arm's analysis (pure): payload at reach, load diagram and plausibility warnings.
 */
import type { Chain } from "../../kinematics/chain";
import { payloadAtReach } from "./atReach";
import type { PayloadAtReach, PayloadAtReachOptions, PayloadAtReachRow, PayloadBasis } from "./atReachTypes";
import type { PayloadInput } from "./input";
import {
  loadDiagram,
  PAYLOAD_STATEMENT,
  payloadWarnings,
  type LoadDiagram,
  type LoadDiagramOptions,
  type PayloadWarning,
} from "./loadDiagram";

export interface PayloadAnalysisOptions {
  readonly loadDiagram: Partial<LoadDiagramOptions>;
  readonly atReach: Partial<PayloadAtReachOptions>;
  /** Relative tolerance of the plausibility warnings. */
  readonly warningTolerance: number;
}

export interface PayloadAnalysis {
  readonly basis: PayloadBasis;
  readonly statement: string;
  readonly atReach: readonly PayloadAtReachRow[];
  readonly atReachDetail: Omit<PayloadAtReach, "rows">;
  readonly loadDiagram: LoadDiagram;
  readonly warnings: readonly PayloadWarning[];
}

/**
 * The payload section of an arm's analysis: payload at reach, load diagram and plausibility warnings.
 * Shape (contract): { basis, atReach: [{ reachMm, offsetMm, payloadKg, limitingJoint, mounting, … }], loadDiagram }.
 */
export function analysePayload(
  chain: Chain,
  input: PayloadInput,
  options: Partial<PayloadAnalysisOptions> = {},
): PayloadAnalysis {
  const atReach = payloadAtReach(chain, input, options.atReach ?? {});
  const { rows, ...detail } = atReach;
  return {
    basis: atReach.basis,
    statement: PAYLOAD_STATEMENT,
    atReach: rows,
    atReachDetail: detail,
    loadDiagram: loadDiagram(input, options.loadDiagram ?? {}),
    warnings: payloadWarnings(input, options.warningTolerance ?? 0),
  };
}
