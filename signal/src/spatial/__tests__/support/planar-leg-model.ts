// A planar walking leg built from kinematics alone (no event rule, no integration): the ankle rests on
// the ground through stance and travels one stride length during swing (minimum-jerk profile, Flash &
// Hogan 1985), the shank turns about the ankle, the foot is flat in stance and pitches in swing. The
// sensor's acceleration is the second derivative of its path (central differences on a 2 kHz grid),
// plus gravity, expressed in a sensor frame mounted at an arbitrary angle; the gyro is the rate of the
// segment angle. Truth (stride length, events) comes from the model's parameters.

export interface PlanarLegOptions {
  segment: "shank" | "foot";
  strideTimeS: number;
  stanceFraction: number;
  strideLengthM: number;
  strides: number;
  sampleRateHz: number;
  /** Shank: sensor distance above the ankle along the shank (m). */
  sensorAboveAnkleM?: number;
  /** Shank angle (rad, lower end forward positive) at IC and at FC. */
  shankAtIcRad?: number;
  shankAtFcRad?: number;
  /** In-plane mounting angle of the sensor on the segment (rad). */
  mountRad?: number;
  /** 3-D tilt of the sensor so its rotation axis is not a sensor axis (rad about x, then y). */
  tiltXRad?: number;
  tiltYRad?: number;
  /** Constant gyro bias (deg/s) on every axis. */
  gyroBiasDegS?: number;
}

export interface PlanarLeg {
  accX: Float64Array;
  accY: Float64Array;
  accZ: Float64Array;
  gyroX: Float64Array;
  gyroY: Float64Array;
  gyroZ: Float64Array;
  valid: Uint8Array;
  /** The sensor-frame direction of the segment's rotation axis (swing-positive). */
  axis: [number, number, number];
  icS: number[];
  fcS: number[];
}

const G = 9.80665;
const minJerk = (s: number) => s * s * s * (10 - 15 * s + 6 * s * s);
const ease = (s: number) => (1 - Math.cos(Math.PI * s)) / 2;

export function planarLeg(o: PlanarLegOptions): PlanarLeg {
  const fine = 2000;
  const T = o.strideTimeS;
  const tSt = T * o.stanceFraction;
  const lead = 0.5;
  const durationS = lead + o.strides * T + 0.5;
  const thIc = o.shankAtIcRad ?? 0.35;
  const thFc = o.shankAtFcRad ?? -0.6;
  const r = o.sensorAboveAnkleM ?? 0.2;

  // Path and angle of the segment at time t (s), ankle at rest before the first IC and after the last.
  const pose = (t: number): { x: number; y: number; angle: number } => {
    const u = t - lead;
    const k = Math.floor(u / T);
    const ph = u - k * T;
    let ax: number;
    let ay = 0.08;
    let shank: number;
    let foot = 0;
    if (u < 0 || k >= o.strides) {
      ax = Math.max(0, Math.min(o.strides, u < 0 ? 0 : o.strides)) * o.strideLengthM;
      shank = u < 0 ? thIc : thIc;
    } else if (ph < tSt) {
      ax = k * o.strideLengthM;
      shank = thIc + (thFc - thIc) * ease(ph / tSt);
    } else {
      const s = (ph - tSt) / (T - tSt);
      ax = (k + minJerk(s)) * o.strideLengthM;
      ay += 0.06 * Math.sin(Math.PI * s) ** 2;
      shank = thFc + (thIc - thFc) * ease(s);
      foot = -0.5 * Math.sin(Math.PI * s) ** 2;
    }
    if (o.segment === "shank") return { x: ax - r * Math.sin(shank), y: ay + r * Math.cos(shank), angle: shank };
    // Foot sensor 6 cm ahead of and 3 cm below the ankle in the foot's frame.
    const c = Math.cos(foot);
    const sn = Math.sin(foot);
    return { x: ax + 0.06 * c + 0.03 * sn, y: ay + 0.06 * sn - 0.03 * c, angle: foot };
  };

  const n = Math.floor(durationS * o.sampleRateHz);
  const out = {
    accX: new Float64Array(n),
    accY: new Float64Array(n),
    accZ: new Float64Array(n),
    gyroX: new Float64Array(n),
    gyroY: new Float64Array(n),
    gyroZ: new Float64Array(n),
  };
  const h = 1 / fine;
  const mount = o.mountRad ?? 0;
  // Sensor frame → 3-D tilt: q = Ry(tiltY)·Rx(tiltX) applied to planar (1, 2, out-of-plane) vectors.
  const ax = o.tiltXRad ?? 0;
  const ay = o.tiltYRad ?? 0;
  const tilt = (v: [number, number, number]): [number, number, number] => {
    const [x, y, z] = v;
    const y1 = y * Math.cos(ax) - z * Math.sin(ax);
    const z1 = y * Math.sin(ax) + z * Math.cos(ax);
    return [x * Math.cos(ay) + z1 * Math.sin(ay), y1, -x * Math.sin(ay) + z1 * Math.cos(ay)];
  };
  const bias = o.gyroBiasDegS ?? 0;
  for (let i = 0; i < n; i++) {
    const t = i / o.sampleRateHz;
    const p0 = pose(t - h);
    const p1 = pose(t);
    const p2 = pose(t + h);
    const accW = [(p2.x - 2 * p1.x + p0.x) / (h * h), (p2.y - 2 * p1.y + p0.y) / (h * h) + G];
    const omega = (p2.angle - p0.angle) / (2 * h);
    // World = R(psi)·sensor, psi = mount + segment angle.
    const psi = mount + p1.angle;
    const c = Math.cos(psi);
    const s = Math.sin(psi);
    const a1 = c * accW[0]! + s * accW[1]!;
    const a2 = -s * accW[0]! + c * accW[1]!;
    const a = tilt([a1, a2, 0]);
    const g = tilt([0, 0, (omega * 180) / Math.PI]);
    out.accX[i] = a[0];
    out.accY[i] = a[1];
    out.accZ[i] = a[2];
    out.gyroX[i] = g[0] + bias;
    out.gyroY[i] = g[1] + bias;
    out.gyroZ[i] = g[2] + bias;
  }
  const icS: number[] = [];
  const fcS: number[] = [];
  for (let k = 0; k <= o.strides; k++) {
    icS.push(lead + k * T);
    if (k < o.strides) fcS.push(lead + k * T + tSt);
  }
  return { ...out, valid: new Uint8Array(n).fill(1), axis: tilt([0, 0, 1]), icS, fcS };
}
