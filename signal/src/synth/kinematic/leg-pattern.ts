import { periodicCurve, type PeriodicCurve } from "./fourier-pattern";

/**
 * Sagittal joint angles over one gait cycle (percent from IC; toe-off at 60 %), degrees.
 * APPROXIMATE shapes after the normative adult data in Winter (1991), The Biomechanics and Motor
 * Control of Human Gait, 2nd ed., and Perry & Burnfield (2010), Gait Analysis, 2nd ed.: rounded to
 * whole degrees at 5 % steps and adjusted so the segments agree with each other (foot flat from
 * ≈ 10 % to 40 %, so the shank angle there is minus the ankle dorsiflexion). They are shapes for
 * synthetic data, not reference values.
 *
 * thigh: thigh from the vertical, knee forward positive (hip flexion less ≈ 8° of pelvic tilt).
 * knee:  knee flexion.  ankle: dorsiflexion positive.
 * Derived: shank = thigh − knee (ankle forward positive); foot pitch = shank + ankle (toes up positive).
 */
export const NORMATIVE_PCT = [0, 5, 10, 15, 20, 25, 30, 35, 40, 45, 50, 55, 60, 65, 70, 75, 80, 85, 90, 95] as const;
export const NORMATIVE_THIGH_DEG = [22, 21, 20, 17, 13, 10, 6, 2, -1, -5, -8, -10, -8, -3, 5, 13, 19, 23, 25, 24] as const;
export const NORMATIVE_KNEE_DEG = [4, 10, 16, 17, 14, 13, 11, 9, 8, 7, 10, 17, 30, 44, 55, 56, 46, 29, 14, 5] as const;
export const NORMATIVE_ANKLE_DEG = [2, -2, -4, -1, 1, 3, 5, 7, 9, 10, 8, 3, -10, -16, -8, -2, 0, 1, 1, 1] as const;
/** Toe-off in the normative tables, fraction of the cycle (Perry & Burnfield 2010: stance ≈ 60 %). */
export const NORMATIVE_STANCE_FRACTION = 0.6;

export interface LegPatternParams {
  romScale: number;
  swingKneeScale: number;
  hyperextensionDeg: number;
  circumductionDeg: number;
}

/** Angles of one leg as smooth periodic functions of the normative phase q (0 = IC, 0.6 = FC). */
export interface LegPattern {
  thigh: PeriodicCurve;
  knee: PeriodicCurve;
  ankle: PeriodicCurve;
  /** Frontal-plane angle of the shank (abduction of the lower end positive), degrees. */
  frontal: PeriodicCurve;
  /** Transverse-plane rotation of the shank (external rotation positive), degrees. */
  transverse: PeriodicCurve;
}

export function legPattern(p: LegPatternParams): LegPattern {
  const pct = [...NORMATIVE_PCT];
  // Stiff knee: flexion above the 50 % value (where swing flexion starts to build) is scaled.
  const kneeBase = NORMATIVE_KNEE_DEG[10];
  let knee = NORMATIVE_KNEE_DEG.map((k, i) => (pct[i]! > 50 ? kneeBase + p.swingKneeScale * (k - kneeBase) : k));
  // Recurvatum: the knee passes into hyperextension in mid-stance (raised-cosine dip, 15–45 %).
  if (p.hyperextensionDeg > 0) {
    knee = knee.map((k, i) => {
      const w = raisedCosine(pct[i]!, 30, 15);
      return (1 - w) * k - w * p.hyperextensionDeg;
    });
  }
  const scaled = (values: readonly number[]) => {
    const mean = values.reduce((s, v) => s + v, 0) / values.length;
    return values.map((v) => mean + p.romScale * (v - mean));
  };
  const frontalTable = pct.map((q) => 2 * Math.sin((2 * Math.PI * q) / 100) + p.circumductionDeg * swingWindow(q));
  const transverseTable = pct.map((q) => 4 * Math.sin((2 * Math.PI * q) / 100 + 1));
  return {
    thigh: periodicCurve(pct, scaled(NORMATIVE_THIGH_DEG)),
    knee: periodicCurve(pct, scaled(knee)),
    ankle: periodicCurve(pct, scaled(NORMATIVE_ANKLE_DEG)),
    frontal: periodicCurve(pct, frontalTable, 6),
    transverse: periodicCurve(pct, transverseTable, 4),
  };
}

/** 1 at `centre`, falling to 0 at ± halfWidth (percent of cycle). */
function raisedCosine(q: number, centre: number, halfWidth: number): number {
  const u = (q - centre) / halfWidth;
  return Math.abs(u) >= 1 ? 0 : 0.5 * (1 + Math.cos(Math.PI * u));
}

/** Smooth window over the normative swing (60–100 %). */
function swingWindow(q: number): number {
  return q <= 60 ? 0 : Math.sin((Math.PI * (q - 60)) / 40) ** 2;
}
