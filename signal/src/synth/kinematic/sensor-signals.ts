import type { Side } from "../../types";
import type { Prng } from "../prng";
import type { Matrix3 } from "../rotation";
import type { BodyModel, Vec3 } from "./body-model";
import type { KinematicPlacement } from "./types";

const RAD = Math.PI / 180;
const GRAVITY_MS2 = 9.81;
/** Step of the central differences (s): small against every model time scale, large against rounding. */
const H_RATE_S = 0.001;
const H_ACC_S = 0.002;

export interface ImpactParams {
  /** ICs of each side, session times (sorted). */
  contacts: Record<Side, number[]>;
  peakMs2: number;
  /** First value of the jolt in the striking shank's sagittal rate, deg/s (applied negative). */
  peakGyroDegS: number;
  /** Ringing frequency (Hz) and decay time constant (s) of the heel-strike transient (approximation). */
  frequencyHz: number;
  decayS: number;
}

export interface RippleBurst {
  startS: number;
  durationS: number;
  frequencyHz: number;
  peakDegS: number;
}

export interface SensorSynthesisParams {
  placement: KinematicPlacement;
  /** Sample times of the file's own clock (s from its first sample). */
  clockS: Float64Array;
  /** Added to every file time to get the body time the sample holds. */
  clockOffsetS: number;
  /** Sensor axes: the nominal body-frame vector v is read as mountᵀ·v. */
  mount: Matrix3;
  impacts: ImpactParams;
  ripple: RippleBurst[];
  gyroNoiseDegS: number;
  accNoiseMs2: number;
  gyroBiasDegS: Vec3;
}

export interface SensorSignals {
  acc: [Float32Array, Float32Array, Float32Array];
  gyro: [Float32Array, Float32Array, Float32Array];
}

/**
 * What one device measures: gyro = the segment's angular velocity in its own frame (deg/s);
 * accelerometer = specific force at the sensor point (its acceleration from the chain kinematics
 * minus gravity, i.e. +9.81 m/s² along "up" at rest), rotated into the segment frame. Then the
 * heel-strike transients, strap ripple, noise, bias and the mounting rotation.
 */
export function synthesizeSensor(model: BodyModel, p: SensorSynthesisParams, prng: Prng): SensorSignals {
  const n = p.clockS.length;
  const acc: [Float32Array, Float32Array, Float32Array] = [new Float32Array(n), new Float32Array(n), new Float32Array(n)];
  const gyro: [Float32Array, Float32Array, Float32Array] = [new Float32Array(n), new Float32Array(n), new Float32Array(n)];
  const seg = segmentOf(p.placement);
  const m = p.mount;
  for (let j = 0; j < n; j++) {
    const t = p.clockS[j]! + p.clockOffsetS;
    const pos = (x: number) => seg.position(model, x);
    const a0 = pos(t - H_ACC_S);
    const a1 = pos(t);
    const a2 = pos(t + H_ACC_S);
    const fWorld: Vec3 = [0, 0, 0];
    for (let k = 0; k < 3; k++) fWorld[k] = (a0[k]! - 2 * a1[k]! + a2[k]!) / (H_ACC_S * H_ACC_S);
    fWorld[1] += GRAVITY_MS2;
    const angles = seg.angles(model, t);
    const fSeg = worldToSegment(angles, fWorld);
    const before = seg.angles(model, t - H_RATE_S);
    const after = seg.angles(model, t + H_RATE_S);
    const w: Vec3 = [0, 0, 0];
    for (let k = 0; k < 3; k++) w[k] = (after[k]! - before[k]!) / (2 * H_RATE_S);
    const gSeg = seg.rates(w);

    const imp = impactAt(p, seg.impactGain, t);
    fSeg[1] += imp.acc;
    fSeg[0] += 0.3 * imp.acc;
    gSeg[2] += imp.gyro;
    const rip = rippleAt(p.ripple, t);
    gSeg[2] += rip.rateDegS;
    fSeg[0] += rip.softTissue;

    for (let k = 0; k < 3; k++) {
      // Sensor component k = column k of the mount · body vector.
      const ak = m[k]! * fSeg[0] + m[3 + k]! * fSeg[1] + m[6 + k]! * fSeg[2];
      const gk = m[k]! * gSeg[0] + m[3 + k]! * gSeg[1] + m[6 + k]! * gSeg[2];
      acc[k]![j] = ak + p.accNoiseMs2 * prng.normal();
      gyro[k]![j] = gk + p.gyroBiasDegS[k]! + p.gyroNoiseDegS * prng.normal();
    }
  }
  return { acc, gyro };
}

/** Segment orientation as [sagittal θ about z, frontal about x, transverse about y] in degrees. */
interface SegmentKinematics {
  position(model: BodyModel, t: number): Vec3;
  angles(model: BodyModel, t: number): Vec3;
  /** Body-frame rates (deg/s) from the time derivatives of `angles` (small out-of-plane angles). */
  rates(d: Vec3): Vec3;
  impactGain: { left: { acc: number; gyro: number }; right: { acc: number; gyro: number } };
}

/**
 * Heel-strike transients reach other segments attenuated (approximation: shock attenuation between
 * the shank and the upper body is large in walking; the gains here are a project choice).
 */
function segmentOf(placement: KinematicPlacement): SegmentKinematics {
  if (placement === "left_shank" || placement === "right_shank") {
    const side: Side = placement === "left_shank" ? "left" : "right";
    const sign = side === "right" ? 1 : -1;
    const same = { acc: 1, gyro: 1 };
    const other = { acc: 0.15, gyro: 0.1 };
    return {
      position: (m, t) => m.shankSensor(side, t),
      angles: (m, t) => {
        const a = m.legAngles(side, t);
        return [a.shank, -sign * a.frontal, a.transverse];
      },
      rates: (d) => [d[1], d[2], d[0]],
      impactGain: side === "left" ? { left: same, right: other } : { left: other, right: same },
    };
  }
  if (placement === "left_wrist" || placement === "right_wrist") {
    const side: Side = placement === "left_wrist" ? "left" : "right";
    const sign = side === "right" ? 1 : -1;
    const gain = { acc: 0.08, gyro: 0.02 };
    return {
      position: (m, t) => m.wrist(side, t),
      angles: (m, t) => [m.armAngleDeg(side, t), -sign * m.armFrontalDeg(side, t), m.trunkAnglesDeg(t)[2]],
      rates: (d) => [d[1], d[2], d[0]],
      impactGain: { left: gain, right: gain },
    };
  }
  const gain = { acc: 0.35, gyro: 0.03 };
  return {
    position: (m, t) => m.lowerBack(t),
    angles: (m, t) => {
      const [pitch, roll, yaw] = m.trunkAnglesDeg(t);
      return [pitch, roll, yaw];
    },
    rates: (d) => [d[1], d[2], d[0]],
    impactGain: { left: gain, right: gain },
  };
}

/** Specific force (world) into the segment frame: Rᵀ·f with R = Rz(θ)·Rx(φ)·Ry(γ). */
function worldToSegment(anglesDeg: Vec3, f: Vec3): Vec3 {
  const [th, ph, ga] = [anglesDeg[0] * RAD, anglesDeg[1] * RAD, anglesDeg[2] * RAD];
  // Rzᵀ
  const c = Math.cos(th);
  const s = Math.sin(th);
  let x = c * f[0] + s * f[1];
  let y = -s * f[0] + c * f[1];
  let z = f[2];
  // Rxᵀ
  const cp = Math.cos(ph);
  const sp = Math.sin(ph);
  const y2 = cp * y + sp * z;
  z = -sp * y + cp * z;
  y = y2;
  // Ryᵀ
  const cg = Math.cos(ga);
  const sg = Math.sin(ga);
  const x2 = cg * x - sg * z;
  z = sg * x + cg * z;
  x = x2;
  return [x, y, z];
}

/**
 * Heel-strike transient as a displacement δ(t) = B·e^(−t/τ)·sin(2πft) from the contact on: the
 * acceleration is δ'' (its first value +peak, upward along the segment), the angular part is the
 * derivative of an angle perturbation of the same form, so it leaves no net rotation.
 */
function impactAt(p: SensorSynthesisParams, gain: SegmentKinematics["impactGain"], t: number): { acc: number; gyro: number } {
  const { peakMs2, frequencyHz: f, decayS: tau } = p.impacts;
  const { peakGyroDegS } = p.impacts;
  if (peakMs2 === 0 && peakGyroDegS === 0) return { acc: 0, gyro: 0 };
  const w = 2 * Math.PI * f;
  let acc = 0;
  let gyro = 0;
  for (const side of ["left", "right"] as const) {
    const list = p.impacts.contacts[side];
    for (let i = upperBound(list, t) - 1; i >= 0; i--) {
      const u = t - list[i]!;
      if (u > 8 * tau) break;
      const e = Math.exp(-u / tau);
      // δ'' for δ = e^(−u/τ) sin(wu), normalised so δ''(0) = 1.
      const d2 = e * ((1 / (tau * tau) - w * w) * Math.sin(w * u) - ((2 * w) / tau) * Math.cos(w * u));
      const d2At0 = -(2 * w) / tau;
      acc += gain[side].acc * peakMs2 * (d2 / d2At0);
      // Angular rate of an angle perturbation e^(−u/τ) sin(wu), first value −peakGyroDegS.
      const d1 = e * (w * Math.cos(w * u) - Math.sin(w * u) / tau);
      gyro += -gain[side].gyro * peakGyroDegS * (d1 / w);
    }
  }
  return { acc, gyro };
}

/** Strap ripple: Hann-windowed sine of the angle; its rate has zero integral over the burst. */
function rippleAt(bursts: readonly RippleBurst[], t: number): { rateDegS: number; softTissue: number } {
  let rate = 0;
  let soft = 0;
  for (let i = upperBoundBursts(bursts, t) - 1; i >= 0; i--) {
    const b = bursts[i]!;
    const u = t - b.startS;
    if (u > 0.5) break;
    if (u < 0 || u > b.durationS) continue;
    const w = 2 * Math.PI * b.frequencyHz;
    const win = 0.5 * (1 - Math.cos((2 * Math.PI * u) / b.durationS));
    const dwin = ((Math.PI / b.durationS) * Math.sin((2 * Math.PI * u) / b.durationS));
    const amp = b.peakDegS / w;
    rate += amp * (dwin * Math.sin(w * u) + win * w * Math.cos(w * u));
    soft += (b.peakDegS * win * Math.sin(w * u)) / 12;
  }
  return { rateDegS: rate, softTissue: soft };
}

function upperBound(a: readonly number[], x: number): number {
  let lo = 0;
  let hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (a[mid]! <= x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

function upperBoundBursts(a: readonly RippleBurst[], x: number): number {
  let lo = 0;
  let hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (a[mid]!.startS <= x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
