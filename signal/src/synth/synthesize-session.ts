import type { Placement } from "../types";
import { buildGaitSchedule, type LegSchedule, type Span, type TurnSpan } from "./gait-schedule";
import { createPrng, type Prng } from "./prng";
import { IDENTITY, type Matrix3, multiply, randomRotation, rotationAngleDeg } from "./rotation";
import {
  DEFAULT_SHANK_SHAPE,
  evaluateGaitPhase,
  evaluateKnots,
  lowerBound,
  shankFundamentalPhase,
  shankKnots,
  turnRate,
  walkingEnvelope,
} from "./segment-waveforms";
import { sensorCsvText } from "./sensor-csv-text";

export type SynthPlacement = Extract<Placement, "left_shank" | "right_shank" | "left_wrist" | "right_wrist" | "lower_back">;
export type ArmCouplingMode = "1:1" | "2:1" | "uncoupled" | "none";
type SidePair<T> = { left: T; right: T };

export interface SynthOptions {
  /** Seed of the generator; the same options and seed give byte-identical files. Default 1. */
  seed?: number;
  /** Session length in seconds (from the earliest file start). Default 120. */
  durationS?: number;
  /** Nominal rate, 60–200 Hz. Default 100. */
  sampleRateHz?: number;
  /** Effective rate differs from nominal by this percentage (clock error). Default 0. */
  rateErrorPct?: number;
  gyroUnits?: "deg/s" | "rad/s";
  /** ISO UTC of the session start (the earliest file). Default "2026-11-23T09:15:02.120Z". */
  startUtc?: string;
  placements?: SynthPlacement[];
  deviceSerials?: Partial<Record<SynthPlacement, string>>;
  /** Write the optional "# placement:" header line. Default true. */
  writePlacement?: boolean;
  /** File start offsets on the session base, seconds (rounded to ms); the earliest becomes 0. */
  startOffsetsS?: Partial<Record<SynthPlacement, number>>;
  /** SD of the sample-time jitter, seconds (clipped to ±0.45 period). Default 0. */
  timestampJitterS?: number;
  /** Mounting misalignment, degrees (0–45) about a random axis; a number applies to every file. */
  misalignmentDeg?: number | Partial<Record<SynthPlacement, number>>;
  /** Shank worn upside down (180° about its forward axis: gyro_y, gyro_z and acc_y change sign). */
  invertedPlacement?: SynthPlacement | null;
  /** Dropped packets: rows removed in [startS, startS + durationS) of the session base. */
  gaps?: { placement: SynthPlacement; startS: number; durationS: number }[];
  /** Gyro range, deg/s: values are clipped to ±range (flat tops). Default none. */
  gyroRangeDegS?: number | null;
  /** Standing periods on the session base (no strides). Lead-in/out standing is added too. */
  standing?: { startS: number; durationS: number }[];
  /** Standing at the start (after the last file has started) and end, seconds. Default 3 / 3. */
  leadInS?: number;
  leadOutS?: number;
  /** Turns: yaw about the vertical with a raised-cosine rate; strides inside are 10 % longer. */
  turns?: { startS: number; durationS: number; angleDeg: number }[];
  strideTimeS?: number;
  strideTimeCvPct?: number;
  stanceFraction?: number | SidePair<number>;
  /** Right IC at this fraction of the left stride (0.5 symmetric). Default 0.5. */
  stepFraction?: number;
  /** Mid-swing peak per side, deg/s. Default 350 × (1.1 s / stride time), clamped 120–450. */
  midSwingPeakDegS?: number | SidePair<number>;
  arm?: {
    coupling?: ArmCouplingMode;
    /** ψ = φ_arm − n·φ_contralateral leg, degrees. Default 20. */
    phaseDeg?: number;
    amplitudeDegS?: number;
    /** Arm cycles per stride when uncoupled. Default 1.4. */
    uncoupledRatio?: number;
    /**
     * Stationary SD of a slow (τ ≈ 2 s) wander of a locked arm's phase, degrees. Default 0. Gaussian
     * phase noise of SD σ gives a mean resultant length R ≈ exp(−σ²/2), so a weaker coupling is
     * σ = √(−2 ln R).
     */
    phaseJitterDeg?: number;
  };
  gyroNoiseDegS?: number;
  accNoiseMs2?: number;
}

export interface SynthFile {
  fileName: string;
  placement: SynthPlacement;
  deviceSerial: string;
  text: string;
  startUtc: string;
  /** File start on the session time base, seconds. */
  startOffsetS: number;
  rowCount: number;
}

export interface SynthLegTruth {
  ic: number[];
  fc: number[];
  strideTimesS: number[];
}

export interface SynthArmLegTruth {
  frequencyRatio: number | null;
  /** Expected circular mean of ψ, degrees in (−180, 180]; null when not locked. */
  meanRelativePhaseDeg: number | null;
}

export interface SynthTruth {
  /** Event times in seconds on the session time base (0 = earliest start_utc). */
  left: SynthLegTruth;
  right: SynthLegTruth;
  /** Both legs' stride times pooled. */
  strideTimesS: number[];
  /** Arm cycles per stride by design (1, 2, the uncoupled ratio) or null without arm swing. */
  armLegRatio: number | null;
  armLeg: { leftArmRightLeg: SynthArmLegTruth; rightArmLeftLeg: SynthArmLegTruth };
  walkingBouts: Span[];
  standing: Span[];
  turns: TurnSpan[];
  gaps: { placement: SynthPlacement; startS: number; endS: number }[];
  invertedPlacement: SynthPlacement | null;
  misalignmentDeg: Partial<Record<SynthPlacement, number>>;
  saturatedSamples: Partial<Record<SynthPlacement, number>>;
  sampleRateHz: number;
  effectiveSampleRateHz: number;
  durationS: number;
}

export type ResolvedSynthOptions = Required<Omit<SynthOptions, "arm" | "invertedPlacement" | "gyroRangeDegS">> & {
  arm: Required<NonNullable<SynthOptions["arm"]>>;
  invertedPlacement: SynthPlacement | null;
  gyroRangeDegS: number | null;
};

export interface SynthSession {
  files: SynthFile[];
  truth: SynthTruth;
  options: ResolvedSynthOptions;
}

const DEFAULT_PLACEMENTS: SynthPlacement[] = ["left_shank", "right_shank", "left_wrist", "right_wrist"];
const GRAVITY = 9.81;
const RAD_PER_DEG = Math.PI / 180;

export function resolveSynthOptions(o: SynthOptions = {}): ResolvedSynthOptions {
  const strideTimeS = o.strideTimeS ?? 1.1;
  const peak = Math.min(450, Math.max(120, (350 * 1.1) / strideTimeS));
  const r: ResolvedSynthOptions = {
    seed: o.seed ?? 1,
    durationS: o.durationS ?? 120,
    sampleRateHz: o.sampleRateHz ?? 100,
    rateErrorPct: o.rateErrorPct ?? 0,
    gyroUnits: o.gyroUnits ?? "deg/s",
    startUtc: o.startUtc ?? "2026-11-23T09:15:02.120Z",
    placements: o.placements ?? DEFAULT_PLACEMENTS,
    deviceSerials: o.deviceSerials ?? {},
    writePlacement: o.writePlacement ?? true,
    startOffsetsS: o.startOffsetsS ?? {},
    timestampJitterS: o.timestampJitterS ?? 0,
    misalignmentDeg: o.misalignmentDeg ?? 0,
    invertedPlacement: o.invertedPlacement ?? null,
    gaps: o.gaps ?? [],
    gyroRangeDegS: o.gyroRangeDegS ?? null,
    standing: o.standing ?? [],
    leadInS: o.leadInS ?? 3,
    leadOutS: o.leadOutS ?? 3,
    turns: o.turns ?? [],
    strideTimeS,
    strideTimeCvPct: o.strideTimeCvPct ?? 2,
    stanceFraction: o.stanceFraction ?? 0.6,
    stepFraction: o.stepFraction ?? 0.5,
    midSwingPeakDegS: o.midSwingPeakDegS ?? peak,
    arm: {
      coupling: o.arm?.coupling ?? "1:1",
      phaseDeg: o.arm?.phaseDeg ?? 20,
      amplitudeDegS: o.arm?.amplitudeDegS ?? 90,
      uncoupledRatio: o.arm?.uncoupledRatio ?? 1.4,
      phaseJitterDeg: o.arm?.phaseJitterDeg ?? 0,
    },
    gyroNoiseDegS: o.gyroNoiseDegS ?? 3,
    accNoiseMs2: o.accNoiseMs2 ?? 0.05,
  };
  if (!(r.sampleRateHz >= 60 && r.sampleRateHz <= 200)) throw new RangeError(`sampleRateHz must be 60–200, got ${r.sampleRateHz}`);
  if (!(r.durationS > 0)) throw new RangeError(`durationS must be positive, got ${r.durationS}`);
  if (!(r.strideTimeS >= 0.6 && r.strideTimeS <= 3)) throw new RangeError(`strideTimeS must be 0.6–3 s, got ${r.strideTimeS}`);
  for (const s of Object.values(sides(r.stanceFraction))) {
    if (!(s >= 0.45 && s <= 0.8)) throw new RangeError(`stanceFraction must be 0.45–0.8, got ${s}`);
  }
  if (!(r.stepFraction > 0.3 && r.stepFraction < 0.7)) throw new RangeError(`stepFraction must be 0.3–0.7, got ${r.stepFraction}`);
  const mis = typeof r.misalignmentDeg === "number" ? [r.misalignmentDeg] : Object.values(r.misalignmentDeg);
  for (const m of mis) if (!(m! >= 0 && m! <= 45)) throw new RangeError(`misalignmentDeg must be 0–45, got ${m}`);
  if (Number.isNaN(Date.parse(r.startUtc))) throw new RangeError(`startUtc is not an ISO date: ${r.startUtc}`);
  return r;
}

function sides(v: number | SidePair<number>): SidePair<number> {
  return typeof v === "number" ? { left: v, right: v } : v;
}

/** Subtracts spans from [a, b]. */
function subtractSpans(a: number, b: number, remove: Span[]): Span[] {
  let parts: Span[] = [{ startS: a, endS: b }];
  for (const r of remove) {
    parts = parts.flatMap((p) => {
      if (r.endS <= p.startS || r.startS >= p.endS) return [p];
      const out: Span[] = [];
      if (r.startS > p.startS) out.push({ startS: p.startS, endS: r.startS });
      if (r.endS < p.endS) out.push({ startS: r.endS, endS: p.endS });
      return out;
    });
  }
  return parts.filter((p) => p.endS - p.startS > 0);
}

/**
 * A deterministic synthetic walking session: one sensor CSV v1 text per placement plus the truth
 * (events, strides, arm–leg design) on the session time base. Signals follow the nominal frame
 * (+x forward, +y up, +z to the subject's right; positive gyro_z = the segment's lower end moving
 * forward), then each file is rotated by its mounting (misalignment, upside-down shank).
 * The scenario is invented; nothing here is recorded from a person.
 */
export function synthesizeSession(options: SynthOptions = {}): SynthSession {
  const o = resolveSynthOptions(options);
  const prng = createPrng(o.seed);
  const T = o.strideTimeS;
  const stance = sides(o.stanceFraction);
  const peaks = sides(o.midSwingPeakDegS);

  // Session base: offsets rounded to ms (start_utc precision), shifted so the earliest is 0.
  const rawOffsets = o.placements.map((p) => Math.round((o.startOffsetsS[p] ?? 0) * 1000) / 1000);
  const minOffset = Math.min(...rawOffsets);
  const offsets = rawOffsets.map((x) => Math.round((x - minOffset) * 1000) / 1000);
  const lastStart = Math.max(...offsets);

  const standing: Span[] = o.standing.map((s) => ({ startS: s.startS, endS: s.startS + s.durationS }));
  const walkStart = lastStart + o.leadInS;
  const walkEnd = o.durationS - o.leadOutS;
  const walkingBouts = subtractSpans(walkStart, walkEnd, standing);
  const turns: TurnSpan[] = o.turns.map((t) => ({ startS: t.startS, endS: t.startS + t.durationS, angleDeg: t.angleDeg }));

  const schedule = buildGaitSchedule(
    {
      walkingBouts,
      turns,
      strideTimeS: T,
      strideTimeCvPct: o.strideTimeCvPct,
      stanceFraction: stance,
      stepFraction: o.stepFraction,
      turnStrideFactor: 1.1,
    },
    prng,
  );
  const legs: SidePair<LegSchedule> = schedule;
  const knots = {
    left: shankKnots(legs.left, { ...DEFAULT_SHANK_SHAPE, midSwingPeakDegS: peaks.left }, T, prng),
    right: shankKnots(legs.right, { ...DEFAULT_SHANK_SHAPE, midSwingPeakDegS: peaks.right }, T, prng),
  };
  const theta = {
    left: shankFundamentalPhase(stance.left, DEFAULT_SHANK_SHAPE),
    right: shankFundamentalPhase(stance.right, DEFAULT_SHANK_SHAPE),
  };
  // Phase random walk of an uncoupled arm, on a 0.1 s grid (0.25 rad/√s).
  const driftStep = 0.1;
  const drift = new Float64Array(Math.ceil(o.durationS / driftStep) + 2);
  for (let i = 1; i < drift.length; i++) drift[i] = drift[i - 1]! + 0.25 * Math.sqrt(driftStep) * prng.normal();
  // Ornstein–Uhlenbeck wander with unit stationary SD for a locked arm (scaled by phaseJitterDeg).
  // Drawn only when asked for, so sessions without it keep their exact pseudo-random sequence.
  const wander = new Float64Array(o.arm.phaseJitterDeg > 0 ? drift.length : 0);
  const ouKeep = Math.exp(-driftStep / 2);
  if (wander.length > 0) wander[0] = prng.normal();
  for (let i = 1; i < wander.length; i++) wander[i] = ouKeep * wander[i - 1]! + Math.sqrt(1 - ouKeep * ouKeep) * prng.normal();
  const mounts = new Map<SynthPlacement, Matrix3>();
  const misalignmentTruth: Partial<Record<SynthPlacement, number>> = {};
  for (const p of o.placements) {
    const deg = typeof o.misalignmentDeg === "number" ? o.misalignmentDeg : (o.misalignmentDeg[p] ?? 0);
    let m = deg > 0 ? randomRotation(deg, prng) : IDENTITY;
    misalignmentTruth[p] = rotationAngleDeg(m);
    if (o.invertedPlacement === p) m = multiply([1, 0, 0, 0, -1, 0, 0, 0, -1], m);
    mounts.set(p, m);
  }

  const effectiveRate = o.sampleRateHz * (1 + o.rateErrorPct / 100);
  const files: SynthFile[] = [];
  const saturatedSamples: Partial<Record<SynthPlacement, number>> = {};
  o.placements.forEach((placement, index) => {
    const filePrng = createPrng(o.seed * 7919 + index * 104729 + 17);
    const offset = offsets[index]!;
    const n = Math.max(0, Math.floor((o.durationS - offset) * effectiveRate));
    const clock = new Float64Array(n);
    const time = new Float64Array(n);
    const maxJitter = 0.45 / effectiveRate;
    for (let j = 0; j < n; j++) {
      const jitter = j === 0 || o.timestampJitterS === 0 ? 0 : Math.max(-maxJitter, Math.min(maxJitter, o.timestampJitterS * filePrng.normal()));
      clock[j] = Math.round((j / effectiveRate + jitter) * 1e5) / 1e5;
      time[j] = offset + clock[j]!;
    }
    const body = bodySignals(placement, time, { legs, knots, theta, walkingBouts, turns, drift, wander, driftStep, o, T }, filePrng);
    const m = mounts.get(placement)!;
    const acc: [Float64Array, Float64Array, Float64Array] = [new Float64Array(n), new Float64Array(n), new Float64Array(n)];
    const gyro: [Float64Array, Float64Array, Float64Array] = [new Float64Array(n), new Float64Array(n), new Float64Array(n)];
    const range = o.gyroRangeDegS;
    let saturated = 0;
    const gyroScale = o.gyroUnits === "rad/s" ? RAD_PER_DEG : 1;
    for (let j = 0; j < n; j++) {
      const [bax, bay, baz] = [body.acc[0][j]!, body.acc[1][j]!, body.acc[2][j]!];
      const [bgx, bgy, bgz] = [body.gyro[0][j]!, body.gyro[1][j]!, body.gyro[2][j]!];
      // Sensor components = Mᵀ · body vector (columns of M are the sensor axes in body coordinates).
      for (let a = 0; a < 3; a++) {
        acc[a]![j] = m[a]! * bax + m[3 + a]! * bay + m[6 + a]! * baz;
        let g = m[a]! * bgx + m[3 + a]! * bgy + m[6 + a]! * bgz;
        if (range !== null && Math.abs(g) > range) {
          g = Math.sign(g) * range;
          saturated++;
        }
        gyro[a]![j] = g * gyroScale;
      }
    }
    saturatedSamples[placement] = saturated;

    // Dropped packets: keep rows outside every gap of this placement.
    const gaps = o.gaps.filter((g) => g.placement === placement);
    let keep: Uint8Array | null = null;
    if (gaps.length) {
      keep = new Uint8Array(n).fill(1);
      for (const g of gaps) {
        for (let j = lowerBound(time, g.startS); j < n && time[j]! < g.startS + g.durationS; j++) keep[j] = 0;
      }
    }
    const pick = (x: Float64Array) => (keep ? x.filter((_, j) => keep![j] === 1) : x);
    const serial = o.deviceSerials[placement] ?? `PND-S-${String(index + 1).padStart(4, "0")}`;
    const startUtc = new Date(Date.parse(o.startUtc) + Math.round(offset * 1000)).toISOString();
    const rows = pick(clock);
    const text = sensorCsvText(
      { deviceSerial: serial, placement: o.writePlacement ? placement : null, sampleRateHz: o.sampleRateHz, startUtc, gyroUnits: o.gyroUnits },
      rows,
      [pick(acc[0]), pick(acc[1]), pick(acc[2])],
      [pick(gyro[0]), pick(gyro[1]), pick(gyro[2])],
    );
    files.push({ fileName: `walk-${placement.replace("_", "-")}-${serial}.csv`, placement, deviceSerial: serial, text, startUtc, startOffsetS: offset, rowCount: rows.length });
  });

  // Both arms follow the same design, each relative to its contralateral leg.
  const armTruth = (): SynthArmLegTruth => {
    switch (o.arm.coupling) {
      case "1:1":
        return { frequencyRatio: 1, meanRelativePhaseDeg: wrapDeg(o.arm.phaseDeg) };
      case "2:1":
        return { frequencyRatio: 2, meanRelativePhaseDeg: wrapDeg(o.arm.phaseDeg) };
      case "uncoupled":
        return { frequencyRatio: o.arm.uncoupledRatio, meanRelativePhaseDeg: null };
      default:
        return { frequencyRatio: null, meanRelativePhaseDeg: null };
    }
  };
  const pooled = [...legs.left.strideTimesS, ...legs.right.strideTimesS];
  return {
    files,
    truth: {
      left: { ic: legs.left.ic, fc: legs.left.fc, strideTimesS: legs.left.strideTimesS },
      right: { ic: legs.right.ic, fc: legs.right.fc, strideTimesS: legs.right.strideTimesS },
      strideTimesS: pooled,
      armLegRatio: armTruth().frequencyRatio,
      armLeg: { leftArmRightLeg: armTruth(), rightArmLeftLeg: armTruth() },
      walkingBouts,
      standing,
      turns,
      gaps: o.gaps.map((g) => ({ placement: g.placement, startS: g.startS, endS: g.startS + g.durationS })),
      invertedPlacement: o.invertedPlacement,
      misalignmentDeg: misalignmentTruth,
      saturatedSamples,
      sampleRateHz: o.sampleRateHz,
      effectiveSampleRateHz: effectiveRate,
      durationS: o.durationS,
    },
    options: o,
  };
}

function wrapDeg(d: number): number {
  let x = d - 360 * Math.floor((d + 180) / 360);
  if (x <= -180) x += 360;
  return x;
}

interface BodyContext {
  legs: SidePair<LegSchedule>;
  knots: SidePair<{ t: Float64Array; v: Float64Array }>;
  theta: SidePair<number>;
  walkingBouts: Span[];
  turns: TurnSpan[];
  drift: Float64Array;
  driftStep: number;
  wander: Float64Array;
  o: ResolvedSynthOptions;
  T: number;
}

/** Body-frame acceleration (m/s², gravity on +y) and angular rate (deg/s) of one segment. */
function bodySignals(
  placement: SynthPlacement,
  time: Float64Array,
  c: BodyContext,
  prng: Prng,
): { acc: [Float64Array, Float64Array, Float64Array]; gyro: [Float64Array, Float64Array, Float64Array] } {
  const n = time.length;
  const ax = new Float64Array(n);
  const ay = new Float64Array(n);
  const az = new Float64Array(n);
  const gx = new Float64Array(n);
  const gy = new Float64Array(n);
  const gz = new Float64Array(n);
  const env = new Float64Array(n);
  const yaw = new Float64Array(n);
  walkingEnvelope(c.walkingBouts, time, env);
  turnRate(c.turns, time, yaw);
  const phase = new Float64Array(n);
  const twoPi = 2 * Math.PI;
  const { o } = c;

  if (placement === "left_shank" || placement === "right_shank") {
    const side = placement === "left_shank" ? "left" : "right";
    evaluateKnots(c.knots[side], time, gz);
    evaluateGaitPhase(c.legs[side].ic, c.T, time, phase);
    for (let j = 0; j < n; j++) {
      const g = twoPi * phase[j]!;
      gx[j] = env[j]! * 15 * Math.sin(2 * g + 1);
      gy[j] = yaw[j]! + env[j]! * 10 * Math.sin(g + 2);
      ax[j] = 0.01 * gz[j]!;
      ay[j] = GRAVITY + env[j]! * 1.2 * Math.sin(2 * g);
      az[j] = env[j]! * 0.5 * Math.sin(g + 0.5);
    }
  } else if (placement === "left_wrist" || placement === "right_wrist") {
    // Each arm swings with the contralateral leg.
    const contra = placement === "left_wrist" ? "right" : "left";
    evaluateGaitPhase(c.legs[contra].ic, c.T, time, phase);
    const { coupling, amplitudeDegS, phaseDeg, uncoupledRatio, phaseJitterDeg } = o.arm;
    const jitter = phaseJitterDeg * RAD_PER_DEG;
    const order = coupling === "2:1" ? 2 : 1;
    const offset = phaseDeg * RAD_PER_DEG;
    for (let j = 0; j < n; j++) {
      const legPhase = twoPi * phase[j]! + c.theta[contra];
      let armPhase: number;
      if (coupling === "uncoupled") {
        const k = Math.min(c.drift.length - 2, Math.max(0, Math.floor(time[j]! / c.driftStep)));
        const u = time[j]! / c.driftStep - k;
        armPhase = (twoPi * uncoupledRatio * time[j]!) / c.T + c.drift[k]! * (1 - u) + c.drift[k + 1]! * u;
      } else if (jitter > 0) {
        const k = Math.min(c.wander.length - 2, Math.max(0, Math.floor(time[j]! / c.driftStep)));
        const u = time[j]! / c.driftStep - k;
        armPhase = order * legPhase + offset + jitter * (c.wander[k]! * (1 - u) + c.wander[k + 1]! * u);
      } else armPhase = order * legPhase + offset;
      const amp = coupling === "none" ? 0 : amplitudeDegS * env[j]!;
      gz[j] = amp * Math.cos(armPhase);
      gx[j] = env[j]! * 8 * Math.sin(legPhase + 1);
      gy[j] = yaw[j]! + env[j]! * 5 * Math.sin(legPhase);
      ax[j] = 0.02 * gz[j]!;
      ay[j] = GRAVITY + env[j]! * 0.8 * Math.sin(2 * legPhase);
      az[j] = env[j]! * 0.3 * Math.sin(legPhase + 0.7);
    }
  } else {
    evaluateGaitPhase(c.legs.left.ic, c.T, time, phase);
    for (let j = 0; j < n; j++) {
      const g = twoPi * phase[j]!;
      const e = env[j]!;
      gz[j] = e * 12 * Math.sin(2 * g);
      gy[j] = yaw[j]! + e * 12 * Math.sin(g);
      gx[j] = e * 8 * Math.sin(g + 1);
      ax[j] = e * 1.5 * Math.sin(2 * g + 1.2);
      ay[j] = GRAVITY + e * 2 * Math.sin(2 * g + 0.3);
      az[j] = e * 0.8 * Math.sin(g);
    }
  }
  const gn = o.gyroNoiseDegS;
  const an = o.accNoiseMs2;
  for (let j = 0; j < n; j++) {
    gx[j] = gx[j]! + gn * prng.normal();
    gy[j] = gy[j]! + gn * prng.normal();
    gz[j] = gz[j]! + gn * prng.normal();
    ax[j] = ax[j]! + an * prng.normal();
    ay[j] = ay[j]! + an * prng.normal();
    az[j] = az[j]! + an * prng.normal();
  }
  return { acc: [ax, ay, az], gyro: [gx, gy, gz] };
}
