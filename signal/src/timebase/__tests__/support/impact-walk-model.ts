import { createPrng } from "../../../synth/prng";
import type { Placement, SensorRecording } from "../../../types";

// A small mechanical model of treadmill-like walking for the clock-alignment tests, built from the
// body rather than from the estimator: heel strikes alternate (with a chosen step asymmetry and
// stride-to-stride jitter); each strike excites every sensor with a damped oscillation (a struck
// segment rings at a few tens of Hz and decays within tens of ms; amplitude largest on the struck
// leg, attenuated elsewhere, arriving a few ms later); each shank also swings (a large, slow
// acceleration at the stride frequency and a gyroscope burst at mid-swing). The true clock of every
// sensor is the model's time; a sensor's clock error makes its samples describe a different moment.

export interface ModelSensor {
  placement: Placement;
  /** Impact amplitude (m/s²) from a left and from a right heel strike. */
  fromLeft: number;
  fromRight: number;
  /** Arrival delay of a strike at this sensor (s). */
  delayS: number;
  /** Clock error: the sample stamped t describes model time t + offsetS + driftSPerS · t. */
  offsetS?: number;
  driftSPerS?: number;
}

export interface WalkModelOptions {
  durationS: number;
  sampleRateHz: number;
  strideS: number;
  /** Left IC → right IC as a fraction of the stride (0.5 = symmetric). */
  stepFraction: number;
  /** SD of stride time (s). */
  jitterS: number;
  /** Walking from/to (s); standing outside. */
  walkFromS: number;
  walkToS: number;
  seed: number;
  sensors: ModelSensor[];
}

const RING_HZ = 30;
const RING_DECAY_S = 0.015;

export function strikeTimes(o: WalkModelOptions): { left: number[]; right: number[] } {
  const prng = createPrng(o.seed);
  const left: number[] = [];
  const right: number[] = [];
  for (let t = o.walkFromS; t + o.strideS < o.walkToS; ) {
    const stride = o.strideS + o.jitterS * prng.normal();
    left.push(t);
    right.push(t + o.stepFraction * stride);
    t += stride;
  }
  return { left, right };
}

export function modelRecordings(o: WalkModelOptions): SensorRecording[] {
  const { left, right } = strikeTimes(o);
  const n = Math.floor(o.durationS * o.sampleRateHz);
  return o.sensors.map((s, si) => {
    const prng = createPrng(o.seed * 31 + si + 1);
    const timeS = new Float64Array(n);
    const acc = [new Float32Array(n), new Float32Array(n), new Float32Array(n)];
    const gyro = [new Float32Array(n), new Float32Array(n), new Float32Array(n)];
    const ownSide = s.placement.startsWith("left_") ? "left" : s.placement.startsWith("right_") ? "right" : null;
    const isLeg = s.placement.endsWith("_shank") || s.placement.endsWith("_foot");
    const own = ownSide === "left" ? left : right;
    const modelTime = (t: number) => t + (s.offsetS ?? 0) + (s.driftSPerS ?? 0) * t;
    const b = s.driftSPerS ?? 0;
    const a = s.offsetS ?? 0;
    // Sample index whose model time is tm (inverse of modelTime).
    const indexAt = (tm: number) => ((tm - a) / (1 + b)) * o.sampleRateHz;
    const ax = new Float64Array(n);
    const ay = new Float64Array(n).fill(9.81);
    const g = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const t = i / o.sampleRateHz;
      timeS[i] = t;
      const tm = modelTime(t);
      if (tm < o.walkFromS || tm > o.walkToS) continue;
      if (isLeg) {
        // Swing: a slow acceleration at the stride frequency.
        const ph = (2 * Math.PI * (tm - o.walkFromS)) / o.strideS + (ownSide === "right" ? 2 * Math.PI * o.stepFraction : 0);
        ax[i] = ax[i]! + 4 * Math.sin(ph);
        ay[i] = ay[i]! + 2 * Math.sin(2 * ph);
      } else {
        ay[i] = ay[i]! + 1.5 * Math.sin((4 * Math.PI * (tm - o.walkFromS)) / o.strideS);
        g[i] = g[i]! + 20 * Math.sin((2 * Math.PI * (tm - o.walkFromS)) / o.strideS);
      }
    }
    const span = (fromTm: number, toTm: number, f: (i: number, tm: number) => void) => {
      const i0 = Math.max(0, Math.ceil(indexAt(fromTm)));
      const i1 = Math.min(n - 1, Math.floor(indexAt(toTm)));
      for (let i = i0; i <= i1; i++) f(i, modelTime(i / o.sampleRateHz));
    };
    if (isLeg) {
      // Sagittal shank rotation: a forward burst at mid-swing (0.2 stride before each own strike), a
      // brief backward rotation as the heel strikes, the slow backward rotation of stance (the shank
      // tilts forward over the planted foot by roughly 30–40° in about 0.6 s), and a deeper one at
      // push-off (toe-off at 62 % of the stride, the textbook stance fraction).
      const bump = (centre: number, w: number, amp: number) =>
        span(centre - 4 * w, centre + 4 * w, (i, tm) => {
          g[i] = g[i]! + amp * Math.exp(-0.5 * ((tm - centre) / w) ** 2);
        });
      for (const ic of own) {
        bump(ic - 0.2 * o.strideS, 0.08 * o.strideS, 250);
        bump(ic + 0.02, 0.02 * o.strideS, -60);
        bump(ic + 0.3 * o.strideS, 0.12 * o.strideS, -50);
        bump(ic + 0.62 * o.strideS, 0.04 * o.strideS, -100);
      }
    }
    for (const [times, amp] of [[left, s.fromLeft], [right, s.fromRight]] as const) {
      if (amp === 0) continue;
      for (const ic of times) {
        const t0 = ic + s.delayS;
        span(t0, t0 + 10 * RING_DECAY_S, (i, tm) => {
          const d = tm - t0;
          const v = amp * Math.exp(-d / RING_DECAY_S) * Math.sin(2 * Math.PI * RING_HZ * d);
          ax[i] = ax[i]! + 0.6 * v;
          ay[i] = ay[i]! + 0.8 * v;
        });
      }
    }
    for (let i = 0; i < n; i++) {
      acc[0]![i] = ax[i]! + 0.05 * prng.normal();
      acc[1]![i] = ay[i]! + 0.05 * prng.normal();
      acc[2]![i] = 0.05 * prng.normal();
      gyro[0]![i] = 2 * prng.normal();
      gyro[1]![i] = 2 * prng.normal();
      gyro[2]![i] = g[i]! + 2 * prng.normal();
    }
    return {
      fileName: `${s.placement}.csv`,
      deviceSerial: `MODEL-${si}`,
      placement: s.placement,
      nominalSampleRateHz: o.sampleRateHz,
      startUtc: "2026-03-02T09:00:00.000Z",
      timeS,
      accX: acc[0]!,
      accY: acc[1]!,
      accZ: acc[2]!,
      gyroX: gyro[0]!,
      gyroY: gyro[1]!,
      gyroZ: gyro[2]!,
    };
  });
}
