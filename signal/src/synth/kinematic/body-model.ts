import type { PerSide, Side } from "../../types";
import type { GaitSchedule, PhaseKnots, WalkingSpan } from "./kinematic-schedule";
import type { LegPattern } from "./leg-pattern";
import { monotoneCubic, type MonotoneCubic } from "./monotone-cubic";

const RAD = Math.PI / 180;

/**
 * Segment lengths, m, from standing height H: proportions after Drillis & Contini (1966) as reproduced in
 * Winter's anthropometry chapter (not re-checked against the source; approximation).
 */
export interface SegmentLengths {
  /** Hip-joint centre to knee: 0.245 H. */
  thighM: number;
  /** Knee to ankle: 0.246 H. */
  shankM: number;
  /** Knee to the shank sensor (worn at mid-shank, common practice). */
  shankSensorM: number;
  /** Hip-joint centre height when standing: 0.530 H (greater trochanter). */
  hipHeightM: number;
  /** Hip-joint centre to shoulder: 0.818 H − 0.530 H. */
  trunkM: number;
  /** Shoulder to wrist (elbow straight): 0.186 H + 0.146 H. */
  armM: number;
  /** Half the distance between the hip-joint centres (≈ 0.191 H / 2 hip width, common practice). */
  pelvisHalfWidthM: number;
  /** Half the shoulder width (0.259 H / 2). */
  shoulderHalfWidthM: number;
}

export function segmentLengths(heightCm: number): SegmentLengths {
  const h = heightCm / 100;
  return {
    thighM: 0.245 * h,
    shankM: 0.246 * h,
    shankSensorM: 0.5 * 0.246 * h,
    hipHeightM: 0.53 * h,
    trunkM: (0.818 - 0.53) * h,
    armM: (0.186 + 0.146) * h,
    pelvisHalfWidthM: (0.191 * h) / 2,
    shoulderHalfWidthM: (0.259 * h) / 2,
  };
}

export interface ArmModelParams {
  /** Arm cycles per contralateral stride; 0 = no swing. */
  ratio: 0 | 1 | 2;
  rangeDeg: number;
  secondHarmonic: number;
  forwardFraction: number;
  /** Phase of the arm pattern, cycles of the arm pattern (set so ψ is as requested). */
  phaseOffsetCycles: number;
  heldStill: boolean;
  tremorDeg: number;
  tremorHz: number;
}

/** Sum of slow sinusoids (postural sway), degrees. */
export interface Sway {
  amplitudesDeg: number[];
  frequenciesHz: number[];
  phasesRad: number[];
}

export interface BodyModelParams {
  schedule: GaitSchedule;
  patterns: PerSide<LegPattern>;
  segments: SegmentLengths;
  arms: PerSide<ArmModelParams>;
  /** Walking speed per step knot (forward pelvis travel), from the stance kinematics. */
  pelvisTravel: PhaseKnots;
  /** Half-amplitudes of the pelvis surge (m) and vertical excursion (m) on the step clock. */
  surgeM: PhaseKnots;
  bobM: PhaseKnots;
  sway: { shank: PerSide<Sway>; thigh: PerSide<Sway>; arm: PerSide<Sway>; trunk: Sway };
}

export interface LegAnglesDeg {
  thigh: number;
  knee: number;
  ankle: number;
  shank: number;
  foot: number;
  frontal: number;
  transverse: number;
}

export type Vec3 = [number, number, number];

/** Noiseless kinematics of the whole body at any session time. */
export interface BodyModel {
  envelope(t: number): number;
  legAngles(side: Side, t: number): LegAnglesDeg;
  /** Stride phase of a leg (ICs at integers). */
  stridePhase(side: Side, t: number): number;
  stepPhase(t: number): number;
  armAngleDeg(side: Side, t: number): number;
  /** Frontal-plane arm angle (abduction positive), degrees. */
  armFrontalDeg(side: Side, t: number): number;
  /** Trunk pitch (forward lean, about +z with the head moving forward negative), roll (about +x), yaw (about +y), degrees. */
  trunkAnglesDeg(t: number): Vec3;
  pelvis(t: number): Vec3;
  shankSensor(side: Side, t: number): Vec3;
  wrist(side: Side, t: number): Vec3;
  lowerBack(t: number): Vec3;
  /** Horizontal hip-to-ankle reach of a leg at normative phase q with ROM multiplier r, m. */
  reachM(side: Side, q: number, r: number): number;
  /** Foot pitch at normative phase q with ROM multiplier r (walking pattern only), degrees. */
  footPitchAtPhaseDeg(side: Side, q: number, r: number): number;
}

const SIDE_SIGN: Record<Side, number> = { left: -1, right: 1 };

export function buildBodyModel(p: BodyModelParams): BodyModel {
  const { schedule, patterns, segments: seg } = p;
  const clocks = {
    normative: { left: clock(schedule.left.normativePhase), right: clock(schedule.right.normativePhase) },
    stride: { left: clock(schedule.left.stridePhase), right: clock(schedule.right.stridePhase) },
    step: clock(schedule.stepPhase),
  };
  const romAt = smooth(schedule.rom);
  // Cubic, not linear, through the step knots: the pelvis velocity must not jump where one step is
  // longer than the next.
  const travelAt = smooth(p.pelvisTravel);
  const surgeAt = smooth(p.surgeM);
  const bobAt = smooth(p.bobM);

  const envelope = (t: number) => walkingEnvelope(schedule.spans, t);
  const sway = (s: Sway, t: number) => {
    let v = 0;
    for (let i = 0; i < s.amplitudesDeg.length; i++) v += s.amplitudesDeg[i]! * Math.sin(2 * Math.PI * s.frequenciesHz[i]! * t + s.phasesRad[i]!);
    return v;
  };
  const scaled = (curve: LegPattern["thigh"], q: number, r: number) => {
    const mean = curve.harmonic(0).re;
    return mean + r * (curve.value(q) - mean);
  };
  const legAngles = (side: Side, t: number): LegAnglesDeg => {
    const e = envelope(t);
    const q = clocks.normative[side].value(t);
    const r = romAt(t);
    const pat = patterns[side];
    const still = 1 - e;
    const thigh = e * scaled(pat.thigh, q, r) + still * sway(p.sway.thigh[side], t);
    const knee = e * scaled(pat.knee, q, r);
    const ankle = e * scaled(pat.ankle, q, r);
    const shank = thigh - knee + still * sway(p.sway.shank[side], t);
    return { thigh, knee, ankle, shank, foot: shank + ankle, frontal: e * pat.frontal.value(q), transverse: e * pat.transverse.value(q) };
  };
  const reachM = (side: Side, q: number, r: number) => {
    const pat = patterns[side];
    const thigh = scaled(pat.thigh, q, r);
    const shank = thigh - scaled(pat.knee, q, r);
    return seg.thighM * Math.sin(thigh * RAD) + seg.shankM * Math.sin(shank * RAD);
  };
  const stepPhase = (t: number) => clocks.step.value(t);
  const pelvis = (t: number): Vec3 => {
    const e = envelope(t);
    const ps = stepPhase(t);
    const x = travelAt(ps) + e * surgeAt(ps) * Math.sin(2 * Math.PI * ps);
    const y = seg.hipHeightM - e * bobAt(ps) * Math.cos(2 * Math.PI * ps);
    // Lateral shift toward the stance leg: leftmost (−z) a quarter stride after the left IC.
    const z = -e * 0.025 * Math.sin(2 * Math.PI * clocks.stride.left.value(t));
    return [x, y, z];
  };
  const trunkAnglesDeg = (t: number): Vec3 => {
    const e = envelope(t);
    const ps = stepPhase(t);
    const ul = clocks.stride.left.value(t);
    return [
      e * 1.5 * Math.sin(2 * Math.PI * ps + 1) + (1 - e) * sway(p.sway.trunk, t),
      e * 3 * Math.sin(2 * Math.PI * ul),
      e * 4 * Math.sin(2 * Math.PI * ul + Math.PI / 2),
    ];
  };
  const contralateral = (side: Side): Side => (side === "left" ? "right" : "left");
  const armAngleDeg = (side: Side, t: number): number => {
    const a = p.arms[side];
    const e = envelope(t);
    const rest = sway(p.sway.arm[side], t) * (1 - e);
    if (a.heldStill) return rest + a.tremorDeg * Math.sin(2 * Math.PI * a.tremorHz * t);
    if (a.ratio === 0 || a.rangeDeg === 0) return rest;
    const u = clocks.stride[contralateral(side)].value(t);
    return e * armPattern(a, a.ratio * u + a.phaseOffsetCycles) + rest;
  };
  const armFrontalDeg = (side: Side, t: number) => envelope(t) * 2 * Math.sin(2 * Math.PI * clocks.stride[contralateral(side)].value(t));
  const shankSensor = (side: Side, t: number): Vec3 => {
    const a = legAngles(side, t);
    const [px, py, pz] = pelvis(t);
    const kx = px + seg.thighM * Math.sin(a.thigh * RAD);
    const ky = py - seg.thighM * Math.cos(a.thigh * RAD);
    return [
      kx + seg.shankSensorM * Math.sin(a.shank * RAD),
      ky - seg.shankSensorM * Math.cos(a.shank * RAD),
      pz + SIDE_SIGN[side] * (seg.pelvisHalfWidthM + seg.shankSensorM * Math.sin(a.frontal * RAD)),
    ];
  };
  const wrist = (side: Side, t: number): Vec3 => {
    const [px, py, pz] = pelvis(t);
    const alpha = armAngleDeg(side, t) * RAD;
    const beta = armFrontalDeg(side, t) * RAD;
    return [
      px + seg.armM * Math.sin(alpha),
      py + seg.trunkM - seg.armM * Math.cos(alpha),
      pz + SIDE_SIGN[side] * (seg.shoulderHalfWidthM + seg.armM * Math.sin(beta)),
    ];
  };
  const lowerBack = (t: number): Vec3 => {
    const [px, py, pz] = pelvis(t);
    return [px - 0.1, py + 0.1, pz];
  };
  return {
    envelope,
    legAngles,
    stridePhase: (side, t) => clocks.stride[side].value(t),
    stepPhase,
    armAngleDeg,
    armFrontalDeg,
    trunkAnglesDeg,
    pelvis,
    shankSensor,
    wrist,
    lowerBack,
    reachM,
    footPitchAtPhaseDeg: (side, q, r) => {
      const pat = patterns[side];
      return scaled(pat.thigh, q, r) - scaled(pat.knee, q, r) + scaled(pat.ankle, q, r);
    },
  };
}

/**
 * Arm angle for pattern phase x (cycles): first harmonic plus a second harmonic (non-sinusoidal
 * swing), scaled to the requested range with `forwardFraction` of it in front of the hanging position.
 */
export function armPattern(a: Pick<ArmModelParams, "rangeDeg" | "secondHarmonic" | "forwardFraction">, x: number): number {
  const { lo, hi } = armShapeRange(a.secondHarmonic);
  const raw = armShape(a.secondHarmonic, x);
  const unit = (raw - lo) / (hi - lo); // 0..1
  return a.rangeDeg * (unit - (1 - a.forwardFraction));
}

/** Shape of the swing: the second harmonic lags by 0.6 rad, so forward and backward swings differ in speed. */
export function armShape(h2: number, x: number): number {
  return Math.cos(2 * Math.PI * x) + h2 * Math.cos(4 * Math.PI * x + 0.6);
}

const shapeRangeCache = new Map<number, { lo: number; hi: number }>();
function armShapeRange(h2: number): { lo: number; hi: number } {
  let r = shapeRangeCache.get(h2);
  if (!r) {
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = 0; i < 4096; i++) {
      const v = armShape(h2, i / 4096);
      lo = Math.min(lo, v);
      hi = Math.max(hi, v);
    }
    r = { lo, hi };
    shapeRangeCache.set(h2, r);
  }
  return r;
}

/** 0 standing, 1 walking: raised-cosine rise from gait start to the first IC, fall over the fade-out. */
export function walkingEnvelope(spans: readonly WalkingSpan[], t: number): number {
  for (const s of spans) {
    if (t <= s.startS || t >= s.endS) continue;
    if (t < s.fullS) return 0.5 * (1 - Math.cos((Math.PI * (t - s.startS)) / (s.fullS - s.startS)));
    if (t <= s.lastIcS) return 1;
    return 0.5 * (1 + Math.cos((Math.PI * (t - s.lastIcS)) / (s.endS - s.lastIcS)));
  }
  return 0;
}

function smooth(k: PhaseKnots): (x: number) => number {
  if (k.t.length < 2) return () => k.v[0] ?? 0;
  const c = monotoneCubic(k.t, k.v);
  return (x) => c.value(x);
}

function clock(k: PhaseKnots): MonotoneCubic {
  return monotoneCubic(k.t, k.v);
}
