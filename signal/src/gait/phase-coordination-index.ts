import { coefficientOfVariationPct, mean } from "./descriptive";
import { firstIndexAbove, firstIndexAtOrAbove } from "./sorted-search";

export interface PhaseCoordination {
  /** φ_i in degrees, one per reference stride with exactly one contralateral IC inside it. */
  phiDeg: number[];
  phiAbsDeg: number;
  pPhiAbsPct: number;
  phiCvPct: number;
  pciPct: number;
}

/**
 * Phase Coordination Index (Plotnik, Giladi & Hausdorff 2007, Exp Brain Res 181:561), as in
 * docs/methods.md#phase-coordination-index: reference leg L = the leg with the longer mean swing
 * time (the caller chooses it); for each reference stride [t_L,i, t_L,i+1) with exactly one IC
 * t_S,i of the other leg inside it, φ_i = 360°·(t_S,i − t_L,i)/(t_L,i+1 − t_L,i);
 * φ_ABS = mean|φ − 180°|; P_φABS = 100·φ_ABS/180; φ_CV = 100·SD(φ)/mean(φ) with SD ddof 1;
 * PCI = φ_CV + P_φABS. φ is not folded into [0°, 180°] (folding biases PCI). Null with fewer than 2
 * phases.
 */
export function phaseCoordinationIndex(
  referenceStrides: ReadonlyArray<{ icS: number; nextIcS: number }>,
  otherInitialContactsS: readonly number[],
): PhaseCoordination | null {
  const phiDeg: number[] = [];
  // The other leg's ICs in ascending order (a copy: the caller's order is not assumed), so the ones
  // inside each stride are found by two binary searches instead of a pass over all of them per
  // stride. The same set of times is found, so the same φ.
  const others = Float64Array.from(otherInitialContactsS).sort();
  for (const s of referenceStrides) {
    const from = firstIndexAbove(others, s.icS);
    if (firstIndexAtOrAbove(others, s.nextIcS, from) - from !== 1) continue;
    phiDeg.push((360 * (others[from]! - s.icS)) / (s.nextIcS - s.icS));
  }
  if (phiDeg.length < 2) return null;
  const phiAbsDeg = mean(phiDeg.map((p) => Math.abs(p - 180)))!;
  const pPhiAbsPct = (100 * phiAbsDeg) / 180;
  const phiCvPct = coefficientOfVariationPct(phiDeg, 1)!;
  return { phiDeg, phiAbsDeg, pPhiAbsPct, phiCvPct, pciPct: phiCvPct + pPhiAbsPct };
}
