import { assertSameLength } from "../check";

/** Wraps an angle in radians to (−π, π]. */
export function wrapPi(angleRad: number): number {
  const twoPi = 2 * Math.PI;
  let a = angleRad - twoPi * Math.floor((angleRad + Math.PI) / twoPi);
  if (a <= -Math.PI) a += twoPi;
  return a;
}

/**
 * n:1 relative phase ψ = wrap(φ_arm − n·φ_leg), radians in (−π, π] (n:m phase locking with m = 1,
 * Tass et al. 1998, Phys Rev Lett 81:3291, the n:m phase difference whose mean resultant length
 * measures locking). n must be a positive integer: with
 * wrapped phases only an integer multiple is well defined, and a non-locked rhythm then drifts
 * through all ψ so its resultant length stays low. n = 1 gives the continuous relative phase.
 */
export function relativePhase(armPhaseRad: ArrayLike<number>, legPhaseRad: ArrayLike<number>, n: number): Float64Array {
  assertSameLength(armPhaseRad, legPhaseRad, "armPhaseRad and legPhaseRad");
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`n must be a positive integer, got ${String(n)}`);
  const out = new Float64Array(armPhaseRad.length);
  for (let i = 0; i < out.length; i++) out[i] = wrapPi(armPhaseRad[i]! - n * legPhaseRad[i]!);
  return out;
}
