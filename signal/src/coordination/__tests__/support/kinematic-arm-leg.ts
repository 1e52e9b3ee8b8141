// A small kinematic model of one arm and the contralateral leg for the coordination tests. Signals
// are built from segment ANGLES written as functions of the leg's gait phase (not from the rules
// under test); ω is their time derivative and accelerations come from rigid-body mechanics, so the
// truth (the model's own fundamental phases) does not share the estimator's assumptions.
import { createPrng } from "../../../synth/prng";

export const G_M_S2 = 9.81;

export interface ArmDesign {
  /** Arm cycles per stride: 1 or 2 (locked), or e.g. 1.4 (a free-running arm). */
  ratio: number;
  /** Amplitude of the arm angle's component at its own fundamental, degrees. */
  fundamentalDeg: number;
  /** The arm fundamental's lead over the leg fundamental (the model's ψ truth), degrees. */
  leadDeg: number;
  /** Amplitude of the arm angle's 2nd harmonic relative to the fundamental (0 = sinusoid). */
  secondHarmonic?: number;
  /** Phase of that harmonic relative to twice the fundamental's phase, degrees. */
  secondHarmonicPhaseDeg?: number;
  /** For ratio 2: a residual stride-frequency component (relative to the 2× amplitude). */
  strideComponent?: number;
  /** Constant offset of the arm angle (forward-positive), degrees. */
  offsetDeg?: number;
}

export interface KinematicOptions {
  seed: number;
  durationS: number;
  sampleRateHz: number;
  strideTimeS: number;
  /** Stride-time CV (fraction). Default 0.02. */
  strideCv?: number;
  arm: ArmDesign;
  /** Gyro white noise SD (deg/s). Default 2. */
  gyroNoiseDegS?: number;
  /** Forward body acceleration amplitude at step frequency (m/s²), braking after each IC. Default 1. */
  bodyForwardAccM_S2?: number;
  /** Heel-strike impact at the wrist (m/s², decaying 25 ms oscillation after each IC). Default 3. */
  impactM_S2?: number;
  /** Shoulder-to-wrist distance (m). Default 0.6. */
  armLengthM?: number;
  /** How the device is worn: its readings are the nominal-frame readings times this matrix. */
  mounting?: "nominal" | "upside-down" | "mirrored" | "upside-down-and-mirrored";
  /** The wrist clock runs this many seconds late (its sample at t holds the motion at t − offset). */
  wristClockOffsetS?: number;
}

export interface KinematicArmLeg {
  sampleRateHz: number;
  strideFrequencyHz: number;
  /** Paired leg's ICs and all ICs of both legs (s). */
  legIcS: number[];
  allIcS: number[];
  /** Shank ω (forward-positive) of the paired leg, deg/s. */
  legOmegaDegS: Float64Array;
  /** Wrist gyro and accelerometer in the device frame (deg/s, m/s²). */
  gyro: [Float64Array, Float64Array, Float64Array];
  acc: [Float64Array, Float64Array, Float64Array];
  /** Forward-positive arm ω as the nominal frame's +z sees it (truth), deg/s. */
  armOmegaTruthDegS: Float64Array;
  /** True arm angle (deg) and truth values. */
  armAngleDeg: Float64Array;
  truth: { psiDeg: number; rangeOfMotionDeg: number };
  steadyMask: Uint8Array;
}

/** Shank elevation angle over one stride (p = 0 at IC): forward-most just before IC (Fourier form). */
const LEG_TERMS: Array<[number, number, number]> = [
  // [harmonic, amplitude deg, phase (fraction of the cycle where the term peaks)]
  [1, 30, 0.97],
  [2, 8, 0.1],
  [3, 3, 0.3],
];
const LEG_FUNDAMENTAL_PEAK = 0.97;

function legAngleDeg(p: number): number {
  let s = 0;
  for (const [k, a, peak] of LEG_TERMS) s += a * Math.cos(2 * Math.PI * k * (p - peak));
  return s;
}

export function kinematicArmLeg(o: KinematicOptions): KinematicArmLeg {
  const fs = o.sampleRateHz;
  const n = Math.round(o.durationS * fs);
  const rand = createPrng(o.seed);
  const cv = o.strideCv ?? 0.02;
  // Paired-leg ICs; the other leg steps half a stride later.
  const legIc: number[] = [0.5];
  while (legIc[legIc.length - 1]! < o.durationS + 2) {
    legIc.push(legIc[legIc.length - 1]! + o.strideTimeS * (1 + cv * Math.max(-3, Math.min(3, rand.normal()))));
  }
  const otherIc = legIc.slice(0, -1).map((t, i) => t + 0.5 * (legIc[i + 1]! - t));
  const allIc = [...legIc, ...otherIc].sort((a, b) => a - b);
  // Gait phase (strides, continuous) of the paired leg at time t.
  const gaitPhase = (t: number): number => {
    if (t <= legIc[0]!) return (t - legIc[0]!) / o.strideTimeS;
    let k = 0;
    while (k + 1 < legIc.length && legIc[k + 1]! <= t) k++;
    const next = legIc[k + 1] ?? legIc[k]! + o.strideTimeS;
    return k + (t - legIc[k]!) / (next - legIc[k]!);
  };
  const a = o.arm;
  const h2 = a.secondHarmonic ?? 0;
  const h2Phase = ((a.secondHarmonicPhaseDeg ?? 0) * Math.PI) / 180;
  const lead = (a.leadDeg * Math.PI) / 180;
  // Leg fundamental phase = 2π(P − 0.97); arm fundamental phase = ratio·2πP + c with
  // c chosen so that arm − ratio·leg = lead.
  const armPhaseConst = lead - a.ratio * 2 * Math.PI * LEG_FUNDAMENTAL_PEAK;
  let drift = 0;
  const armAngleAt = (P: number): number => {
    const phi = a.ratio * 2 * Math.PI * P + armPhaseConst + drift;
    let th = a.fundamentalDeg * (Math.cos(phi) + h2 * Math.cos(2 * phi + h2Phase)) + (a.offsetDeg ?? 0);
    if (a.strideComponent) th += a.strideComponent * a.fundamentalDeg * Math.cos(2 * Math.PI * P + 0.7);
    return th;
  };
  const offset = o.wristClockOffsetS ?? 0;
  const dt = 1 / fs;
  const legAngle = new Float64Array(n);
  const armAngle = new Float64Array(n);
  const armAnglePrev = new Float64Array(n);
  const armAngleNext = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = i * dt;
    legAngle[i] = legAngleDeg(gaitPhase(t) % 1);
    const ta = t - offset;
    if (a.ratio !== 1 && a.ratio !== 2) drift += rand.normal() * 0.25 * Math.sqrt(dt);
    armAngle[i] = armAngleAt(gaitPhase(ta));
    armAnglePrev[i] = armAngleAt(gaitPhase(ta - dt));
    armAngleNext[i] = armAngleAt(gaitPhase(ta + dt));
  }
  const legOmega = new Float64Array(n);
  const noise = o.gyroNoiseDegS ?? 2;
  for (let i = 1; i < n - 1; i++) legOmega[i] = (legAngle[i + 1]! - legAngle[i - 1]!) / (2 * dt) + noise * rand.normal();
  const armOmega = new Float64Array(n);
  const armAlpha = new Float64Array(n);
  const rad = Math.PI / 180;
  for (let i = 0; i < n; i++) {
    armOmega[i] = (armAngleNext[i]! - armAnglePrev[i]!) / (2 * dt);
    armAlpha[i] = ((armAngleNext[i]! - 2 * armAngle[i]! + armAnglePrev[i]!) / (dt * dt)) * rad;
  }
  // Body forward/vertical acceleration, braking after each IC (velocity peaks at IC), impacts.
  const bodyAcc = o.bodyForwardAccM_S2 ?? 1;
  const impact = o.impactM_S2 ?? 3;
  const r = o.armLengthM ?? 0.6;
  const gyro: [Float64Array, Float64Array, Float64Array] = [new Float64Array(n), new Float64Array(n), new Float64Array(n)];
  const acc: [Float64Array, Float64Array, Float64Array] = [new Float64Array(n), new Float64Array(n), new Float64Array(n)];
  let icIdx = 0;
  for (let i = 0; i < n; i++) {
    const t = i * dt - offset;
    while (icIdx + 1 < allIc.length && allIc[icIdx + 1]! <= t) icIdx++;
    const lastIc = allIc[icIdx]!;
    const stepT = (allIc[icIdx + 1] ?? lastIc + o.strideTimeS / 2) - lastIc;
    const q = (t - lastIc) / stepT;
    const since = t - lastIc;
    const ring = since >= 0 && since < 0.15 ? Math.exp(-since / 0.025) * Math.cos(2 * Math.PI * 20 * since) : 0;
    const fwd = -bodyAcc * Math.sin(2 * Math.PI * q) - 0.4 * impact * ring;
    const up = 1.5 * Math.cos(2 * Math.PI * q) + impact * ring;
    const th = armAngle[i]! * rad;
    const w = armOmega[i]! * rad;
    const al = armAlpha[i]!;
    // World (forward F, up U) specific force of the wrist: body + arm about the shoulder + gravity.
    const fF = fwd + r * (al * Math.cos(th) - w * w * Math.sin(th));
    const fU = up + r * (al * Math.sin(th) + w * w * Math.cos(th)) + G_M_S2;
    // Nominal sensor axes: x = (cos θ, sin θ), y = (−sin θ, cos θ) in (F, U); z = right.
    const ax = fF * Math.cos(th) + fU * Math.sin(th);
    const ay = -fF * Math.sin(th) + fU * Math.cos(th);
    const yaw = 8 * Math.sin(2 * Math.PI * gaitPhase(t)); // trunk yaw, deg/s about U
    const gx = yaw * Math.sin(th);
    const gy = yaw * Math.cos(th);
    const gz = armOmega[i]!;
    const m = o.mounting ?? "nominal";
    const sx = m === "mirrored" || m === "upside-down-and-mirrored" ? -1 : 1;
    const sy = m === "upside-down" || m === "upside-down-and-mirrored" ? -1 : 1;
    const sz = sx * sy;
    gyro[0][i] = sx * gx + noise * rand.normal();
    gyro[1][i] = sy * gy + noise * rand.normal();
    gyro[2][i] = sz * gz + noise * rand.normal();
    acc[0][i] = sx * ax + 0.05 * rand.normal();
    acc[1][i] = sy * ay + 0.05 * rand.normal();
    acc[2][i] = 0.3 * Math.sin(2 * Math.PI * gaitPhase(t)) * sz + 0.05 * rand.normal();
  }
  // Steady: from the 3rd IC to the 3rd-last within the recording.
  const inside = legIc.filter((t) => t < o.durationS - 0.5);
  const mask = new Uint8Array(n);
  mask.fill(1, Math.ceil(inside[2]! * fs), Math.floor(inside[inside.length - 3]! * fs));
  // Truth range of motion: median over strides of max − min of the true arm angle.
  const ranges: number[] = [];
  for (let k = 2; k + 3 < inside.length; k++) {
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = Math.ceil(inside[k]! * fs); i < Math.floor(inside[k + 1]! * fs); i++) {
      lo = Math.min(lo, armAngle[i]!);
      hi = Math.max(hi, armAngle[i]!);
    }
    ranges.push(hi - lo);
  }
  ranges.sort((x, y) => x - y);
  return {
    sampleRateHz: fs,
    strideFrequencyHz: 1 / o.strideTimeS,
    legIcS: legIc.filter((t) => t < o.durationS),
    allIcS: allIc.filter((t) => t < o.durationS),
    legOmegaDegS: legOmega,
    gyro,
    acc,
    armOmegaTruthDegS: armOmega,
    armAngleDeg: armAngle,
    truth: { psiDeg: a.leadDeg, rangeOfMotionDeg: ranges[ranges.length >> 1]! },
    steadyMask: mask,
  };
}
