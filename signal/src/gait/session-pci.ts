import type { Side, Stride } from "../types";
import { phaseCoordinationIndex } from "./phase-coordination-index";

export interface SessionPci {
  /** PCI %, null when either leg or either mean swing time is missing, or fewer than 2 phases. */
  pciPct: number | null;
  /** Phases φ that went into it (0 when none). */
  phaseCount: number;
  /** The reference leg the phases were taken against; null when PCI was not attempted. */
  referenceSide: Side | null;
}

/**
 * PCI of a session (docs/methods.md#phase-coordination-index). The reference leg is the one with the
 * longer mean swing time (Plotnik, Giladi & Hausdorff 2007, Exp Brain Res 181:561); a tie goes to the
 * left leg. Its steady strides are the reference strides, and every initial contact of the other leg
 * is offered to them (phaseCoordinationIndex keeps the strides with exactly one inside).
 */
export function sessionPci(
  swingTimeMeanS: Readonly<Record<Side, number | null>>,
  steadyStrides: readonly Stride[],
  initialContactsS: Readonly<Record<Side, readonly number[] | null>>,
): SessionPci {
  const swL = swingTimeMeanS.left;
  const swR = swingTimeMeanS.right;
  if (swL === null || swR === null || initialContactsS.left === null || initialContactsS.right === null) {
    return { pciPct: null, phaseCount: 0, referenceSide: null };
  }
  const ref: Side = swL >= swR ? "left" : "right";
  const otherContacts = initialContactsS[ref === "left" ? "right" : "left"]!;
  const r = phaseCoordinationIndex(steadyStrides.filter((s) => s.side === ref), otherContacts);
  return { pciPct: r?.pciPct ?? null, phaseCount: r?.phiDeg.length ?? 0, referenceSide: ref };
}
