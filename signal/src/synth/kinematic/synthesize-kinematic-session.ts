import type { Bout, PerSide, SensorRecording, Side } from "../../types";
import { createPrng, type Prng } from "../prng";
import { IDENTITY, type Matrix3, multiply, randomRotation } from "../rotation";
import { armRangeDeg, circularMeanDeg, strideRelativePhaseDeg, wrapDeg } from "./arm-truth";
import { type ArmModelParams, type BodyModel, buildBodyModel, segmentLengths, type Sway } from "./body-model";
import { buildKinematicSchedule, type GaitSchedule, type PhaseKnots } from "./kinematic-schedule";
import { legPattern, NORMATIVE_STANCE_FRACTION } from "./leg-pattern";
import { type RippleBurst, synthesizeSensor } from "./sensor-signals";
import type {
  KinematicArmTruth,
  KinematicLegTruth,
  KinematicOptions,
  KinematicPlacement,
  KinematicSession,
  KinematicStrideTruth,
  KinematicSummaryTruth,
  SynthesizeKinematicSession,
  WristWear,
} from "./types";

const SIDES = ["left", "right"] as const;
const DEFAULT_PLACEMENTS: KinematicPlacement[] = ["left_shank", "right_shank", "left_wrist", "right_wrist"];
const WEAR: Record<WristWear, Matrix3> = {
  standard: IDENTITY,
  mirrored: [-1, 0, 0, 0, 1, 0, 0, 0, -1],
  "upside-down": [1, 0, 0, 0, -1, 0, 0, 0, -1],
};

/**
 * A walking session from a kinematic body model (segment angles over the gait cycle, pelvis moving
 * forward, arms locked to the legs), measured by virtual IMUs. The contacts are the model's own
 * (schedule knots of the segment-angle phase), not features of any signal. Deterministic per seed.
 * The scenario is invented; nothing is recorded from a person.
 */
export const synthesizeKinematicSession: SynthesizeKinematicSession = (options: KinematicOptions = {}): KinematicSession => {
  const o = resolve(options);
  const prng = createPrng(o.seed);
  const schedule = buildKinematicSchedule(
    {
      firstStartS: o.leadInS,
      standingBetweenS: o.standingBetweenS,
      bouts: o.bouts.map((b) => ({
        walkingS: b.durationS,
        strideTimeS: b.strideTimeS ?? o.strideTimeS,
        strideTimeCvPct: b.strideTimeCvPct ?? o.strideTimeCvPct,
        romScale: b.romScale ?? 1,
      })),
      stanceFraction: o.stance,
      stepFraction: o.stepFraction,
      episodes: (options.shortStrideEpisodes ?? []).map((e) => ({
        boutIndex: e.boutIndex ?? 0,
        startS: e.startS,
        durationS: e.durationS,
        strideTimeScale: e.strideTimeScale ?? 0.6,
        romScale: e.romScale ?? 0.5,
        strideTimeCvPct: e.strideTimeCvPct ?? 8,
      })),
      hesitations: (options.hesitations ?? []).map((h) => ({ boutIndex: h.boutIndex ?? 0, atS: h.atS, durationS: h.durationS })),
    },
    prng,
  );
  if (schedule.left.strides.every((s) => s.boutEdge || s.containsPause)) {
    throw new RangeError("no stride away from a bout's edges or pauses: make a bout longer");
  }
  const durationS = schedule.endS + o.leadOutS;
  const patterns = {
    left: legPattern(o.legs.left),
    right: legPattern(o.legs.right),
  };
  const segments = segmentLengths(o.heightCm);
  const swayOf = (sdDegS: number): Sway => slowSway(sdDegS, prng);
  const arms: PerSide<ArmModelParams> = { left: armParams(o, "left"), right: armParams(o, "right") };
  const partial = {
    schedule,
    patterns,
    segments,
    arms,
    sway: {
      shank: { left: swayOf(o.noise.standingSwayDegS), right: swayOf(o.noise.standingSwayDegS) },
      thigh: { left: swayOf(0.5 * o.noise.standingSwayDegS), right: swayOf(0.5 * o.noise.standingSwayDegS) },
      arm: { left: swayOf(o.noise.standingSwayDegS), right: swayOf(o.noise.standingSwayDegS) },
      trunk: swayOf(0.5 * o.noise.standingSwayDegS),
    },
  };
  // First pass (pelvis at rest) for the reach of each leg; then the pelvis travel from it.
  const still: PhaseKnots = { t: [0, 1], v: [0, 0] };
  const probe = buildBodyModel({ ...partial, pelvisTravel: still, surgeM: still, bobM: still });
  const strideSpeeds = strideSpeedsMPerS(schedule, probe, 0.152 * (o.heightCm / 100));
  const travel = pelvisTravel(schedule, probe, strideSpeeds, segments.thighM + segments.shankM);
  const model = buildBodyModel({ ...partial, ...travel });
  for (const side of SIDES) setArmPhase(model, schedule, arms[side], side, o.arms.relativePhaseDeg);

  // Devices.
  const recordings: SensorRecording[] = [];
  const fs = o.sampleRateHz;
  const n = Math.floor(durationS * fs);
  const clockS = new Float64Array(n);
  for (let j = 0; j < n; j++) clockS[j] = Math.round((j / fs) * 1e6) / 1e6;
  const contacts = { left: schedule.left.ic, right: schedule.right.ic };
  o.placements.forEach((placement, index) => {
    const devicePrng = createPrng(o.seed * 7919 + index * 104729 + 31);
    let mount: Matrix3 = IDENTITY;
    const mis = o.misalignmentDeg[placement] ?? 0;
    if (mis > 0) mount = randomRotation(mis, devicePrng);
    const side: Side = placement.startsWith("left") ? "left" : "right";
    if (placement.endsWith("_wrist")) mount = multiply(WEAR[o.arms.wear[side]], mount);
    const ripple = placement.endsWith("_shank") ? rippleBursts(schedule, side, o.noise.rippleDegS, devicePrng) : [];
    const bias: [number, number, number] = [0, 0, 0].map(() => o.noise.gyroBiasDegS * devicePrng.normal()) as [number, number, number];
    const signals = synthesizeSensor(
      model,
      {
        placement,
        clockS,
        clockOffsetS: o.clockOffsetS[placement] ?? 0,
        mount,
        impacts: { contacts, peakMs2: o.noise.impactMs2, peakGyroDegS: o.noise.impactGyroDegS, frequencyHz: 20, decayS: 0.015 },
        ripple,
        gyroNoiseDegS: o.noise.gyroDegS,
        accNoiseMs2: o.noise.accMs2,
        gyroBiasDegS: bias,
      },
      devicePrng,
    );
    const serial = `PND-K-${String(index + 1).padStart(4, "0")}`;
    recordings.push({
      fileName: `kinematic-${placement.replace("_", "-")}-${serial}.csv`,
      deviceSerial: serial,
      placement,
      nominalSampleRateHz: fs,
      startUtc: o.startUtc,
      timeS: clockS.slice(),
      accX: signals.acc[0],
      accY: signals.acc[1],
      accZ: signals.acc[2],
      gyroX: signals.gyro[0],
      gyroY: signals.gyro[1],
      gyroZ: signals.gyro[2],
    });
  });

  // Truth.
  const legTruth = (side: Side): KinematicLegTruth => ({
    ic: schedule[side].ic.slice(),
    fc: schedule[side].fc.slice(),
    strides: schedule[side].strides.map((s) => {
      const strideTimeS = s.nextIcS - s.icS;
      const lengthM = model.pelvis(s.nextIcS)[0] - model.pelvis(s.icS)[0];
      const stanceTimeS = s.fcS - s.icS;
      return {
        side,
        icS: s.icS,
        nextIcS: s.nextIcS,
        fcS: s.fcS,
        strideTimeS,
        stanceTimeS,
        swingTimeS: s.nextIcS - s.fcS,
        stancePct: (100 * stanceTimeS) / strideTimeS,
        containsPause: s.containsPause,
        boutEdge: s.boutEdge,
        boutIndex: s.boutIndex,
        strideLengthM: lengthM,
        walkingSpeedMPerS: lengthM / (strideTimeS - pauseInside(schedule.hesitations, s.icS, s.nextIcS)),
      } satisfies KinematicStrideTruth;
    }),
  });
  const left = legTruth("left");
  const right = legTruth("right");
  const armTruth = (side: Side): KinematicArmTruth | null => {
    if (!o.placements.includes(`${side}_wrist` as KinematicPlacement)) return null;
    return buildArmTruth(model, schedule, arms[side], side, o.arms.relativePhaseDeg, o.arms.wear[side]);
  };
  return {
    recordings,
    truth: {
      left,
      right,
      summary: summarise(left, right),
      arms: { left: armTruth("left"), right: armTruth("right") },
      bouts: schedule.spans.map((s) => ({ startS: s.startS, endS: s.lastIcS })),
      hesitations: schedule.hesitations,
      standing: standingSpans(schedule, durationS),
      clockOffsetS: { ...o.clockOffsetS },
      sampleRateHz: fs,
      durationS,
    },
    model: {
      shankAngleDeg: (side, t) => model.legAngles(side, t).shank,
      shankRateDegS: (side, t) => (model.legAngles(side, t + 1e-4).shank - model.legAngles(side, t - 1e-4).shank) / 2e-4,
      thighAngleDeg: (side, t) => model.legAngles(side, t).thigh,
      kneeFlexionDeg: (side, t) => model.legAngles(side, t).knee,
      ankleDorsiflexionDeg: (side, t) => model.legAngles(side, t).ankle,
      footPitchDeg: (side, t) => model.legAngles(side, t).foot,
      armAngleDeg: (side, t) => model.armAngleDeg(side, t),
      pelvisPositionM: (t) => {
        const [x, y] = model.pelvis(t);
        return [x, y];
      },
    },
  };
};

type Resolved = ReturnType<typeof resolve>;

function resolve(o: KinematicOptions) {
  const strideTimeS = o.strideTimeS ?? 1.1;
  const stanceFraction = o.stanceFraction ?? NORMATIVE_STANCE_FRACTION;
  const leg = (side: Side) => {
    const l = o.legs?.[side] ?? {};
    return {
      romScale: l.romScale ?? 1,
      swingKneeScale: l.swingKneeScale ?? 1,
      hyperextensionDeg: l.hyperextensionDeg ?? 0,
      circumductionDeg: l.circumductionDeg ?? 0,
      stanceFraction: l.stanceFraction ?? stanceFraction,
    };
  };
  const coupling = o.arms?.coupling ?? "1:1";
  const range = o.arms?.rangeDeg ?? 30;
  const r = {
    seed: o.seed ?? 1,
    sampleRateHz: o.sampleRateHz ?? 100,
    startUtc: o.startUtc ?? "2026-11-23T09:15:02.120Z",
    placements: o.placements ?? DEFAULT_PLACEMENTS,
    leadInS: o.leadInS ?? 4,
    leadOutS: o.leadOutS ?? 4,
    bouts: o.bouts ?? [{ durationS: 90 }],
    standingBetweenS: o.standingBetweenS ?? 6,
    strideTimeS,
    strideTimeCvPct: o.strideTimeCvPct ?? 2,
    stepFraction: o.stepFraction ?? 0.5,
    legs: { left: leg("left"), right: leg("right") },
    stance: { left: leg("left").stanceFraction, right: leg("right").stanceFraction },
    arms: {
      coupling,
      relativePhaseDeg: o.arms?.relativePhaseDeg ?? 20,
      range: typeof range === "number" ? { left: range, right: range } : { left: range.left ?? 30, right: range.right ?? 30 },
      secondHarmonic: (o.arms?.secondHarmonicPct ?? (coupling === "1:1" ? 40 : 0)) / 100,
      forwardFraction: o.arms?.forwardFraction ?? 0.4,
      heldStill: o.arms?.heldStill ?? [],
      tremorDeg: o.arms?.tremor?.amplitudeDeg ?? 0.05,
      tremorHz: o.arms?.tremor?.frequencyHz ?? 5,
      wear: { left: o.arms?.wear?.left ?? "standard", right: o.arms?.wear?.right ?? "standard" },
    },
    heightCm: o.heightCm ?? 172,
    clockOffsetS: o.clockOffsetS ?? {},
    misalignmentDeg: o.misalignmentDeg ?? {},
    noise: {
      gyroDegS: o.noise?.gyroDegS ?? 1.5,
      accMs2: o.noise?.accMs2 ?? 0.05,
      gyroBiasDegS: o.noise?.gyroBiasDegS ?? 0.5,
      impactMs2: o.noise?.impactMs2 ?? 25,
      impactGyroDegS: o.noise?.impactGyroDegS ?? 30,
      rippleDegS: o.noise?.rippleDegS ?? 12,
      standingSwayDegS: o.noise?.standingSwayDegS ?? 2,
    },
  };
  const check = (ok: boolean, message: string) => {
    if (!ok) throw new RangeError(message);
  };
  check(r.sampleRateHz >= 60 && r.sampleRateHz <= 200, `sampleRateHz must be 60–200, got ${r.sampleRateHz}`);
  check(!Number.isNaN(Date.parse(r.startUtc)), `startUtc is not an ISO date: ${r.startUtc}`);
  check(r.bouts.length > 0, "at least one bout is needed");
  for (const b of r.bouts) {
    const t = b.strideTimeS ?? strideTimeS;
    check(b.durationS > 0, `bout durationS must be positive, got ${b.durationS}`);
    check(t >= 0.6 && t <= 4, `strideTimeS must be 0.6–4 s, got ${t}`);
    check((b.romScale ?? 1) > 0 && (b.romScale ?? 1) <= 1.3, `bout romScale must be in (0, 1.3], got ${b.romScale}`);
  }
  check(strideTimeS >= 0.6 && strideTimeS <= 4, `strideTimeS must be 0.6–4 s, got ${strideTimeS}`);
  check(r.strideTimeCvPct >= 0 && r.strideTimeCvPct <= 20, `strideTimeCvPct must be 0–20, got ${r.strideTimeCvPct}`);
  check(r.stepFraction > 0.3 && r.stepFraction < 0.7, `stepFraction must be 0.3–0.7, got ${r.stepFraction}`);
  check(r.standingBetweenS >= 2, `standingBetweenS must be ≥ 2 s, got ${r.standingBetweenS}`);
  check(r.leadInS >= 1 && r.leadOutS >= 0, "leadInS must be ≥ 1 s and leadOutS ≥ 0");
  check(r.noise.impactGyroDegS >= 0 && r.noise.impactGyroDegS <= 300, `impactGyroDegS must be 0–300, got ${r.noise.impactGyroDegS}`);
  check(r.heightCm >= 100 && r.heightCm <= 230, `heightCm must be 100–230, got ${r.heightCm}`);
  for (const side of SIDES) {
    const l = r.legs[side];
    check(l.stanceFraction >= 0.5 && l.stanceFraction <= 0.85, `${side} stanceFraction must be 0.5–0.85, got ${l.stanceFraction}`);
    check(l.romScale > 0 && l.romScale <= 1.3, `${side} romScale must be in (0, 1.3], got ${l.romScale}`);
    check(l.swingKneeScale >= 0 && l.swingKneeScale <= 1.2, `${side} swingKneeScale must be 0–1.2, got ${l.swingKneeScale}`);
    check(l.hyperextensionDeg >= 0 && l.hyperextensionDeg <= 20, `${side} hyperextensionDeg must be 0–20, got ${l.hyperextensionDeg}`);
    check(l.circumductionDeg >= 0 && l.circumductionDeg <= 25, `${side} circumductionDeg must be 0–25, got ${l.circumductionDeg}`);
    check(r.arms.range[side] >= 0 && r.arms.range[side] <= 90, `${side} arm rangeDeg must be 0–90, got ${r.arms.range[side]}`);
  }
  check(r.arms.forwardFraction >= 0 && r.arms.forwardFraction <= 1, `forwardFraction must be 0–1, got ${r.arms.forwardFraction}`);
  check(r.arms.secondHarmonic >= 0 && r.arms.secondHarmonic <= 0.8, "secondHarmonicPct must be 0–80");
  for (const h of o.hesitations ?? []) {
    check(h.durationS >= 0.2 && h.durationS <= 5, `hesitation durationS must be 0.2–5 s, got ${h.durationS}`);
    check((h.boutIndex ?? 0) >= 0 && (h.boutIndex ?? 0) < r.bouts.length, `hesitation boutIndex ${h.boutIndex} names no bout`);
  }
  for (const e of o.shortStrideEpisodes ?? []) {
    check(e.durationS > 0, "episode durationS must be positive");
    check((e.boutIndex ?? 0) >= 0 && (e.boutIndex ?? 0) < r.bouts.length, `episode boutIndex ${e.boutIndex} names no bout`);
    check((e.strideTimeScale ?? 0.6) >= 0.4 && (e.strideTimeScale ?? 0.6) <= 1, "episode strideTimeScale must be 0.4–1");
    check((e.romScale ?? 0.5) >= 0.2 && (e.romScale ?? 0.5) <= 1, "episode romScale must be 0.2–1");
  }
  for (const [p, v] of Object.entries(r.misalignmentDeg)) check(v! >= 0 && v! <= 45, `misalignmentDeg of ${p} must be 0–45, got ${v}`);
  for (const [p, v] of Object.entries(r.clockOffsetS)) check(Math.abs(v!) <= 2, `clockOffsetS of ${p} must be within ±2 s, got ${v}`);
  return r;
}

function armParams(o: Resolved, side: Side): ArmModelParams {
  const a = o.arms;
  return {
    ratio: a.coupling === "none" ? 0 : a.coupling === "2:1" ? 2 : 1,
    rangeDeg: a.range[side],
    secondHarmonic: a.secondHarmonic,
    forwardFraction: a.forwardFraction,
    phaseOffsetCycles: 0,
    heldStill: a.heldStill.includes(side),
    tremorDeg: a.tremorDeg,
    tremorHz: a.tremorHz,
  };
}

/** Steady strides of a leg: not at a bout edge and holding no pause (for phase and range truth). */
function steadyStrides(schedule: GaitSchedule, side: Side) {
  return schedule[side].strides.filter((s) => !s.boutEdge && !s.containsPause);
}

/**
 * Sets the arm's pattern phase so the model realises the requested ψ: measured on the middle steady
 * stride of the contralateral leg with the arm at zero offset, then shifted by the difference.
 */
function setArmPhase(model: BodyModel, schedule: GaitSchedule, arm: ArmModelParams, side: Side, requestedDeg: number): void {
  if (arm.ratio === 0 || arm.heldStill || arm.rangeDeg === 0) return;
  const strides = steadyStrides(schedule, side === "left" ? "right" : "left");
  const s = strides[strides.length >> 1];
  if (!s) return;
  arm.phaseOffsetCycles = 0;
  const now = strideRelativePhaseDeg(model, side, arm.ratio, s.icS, s.nextIcS).angle;
  // Harmonic n of the arm moves by 360°·offset per cycle of offset (pattern phase x = n·u + offset).
  arm.phaseOffsetCycles = wrapDeg(requestedDeg - now) / 360;
}

function buildArmTruth(
  model: BodyModel,
  schedule: GaitSchedule,
  arm: ArmModelParams,
  side: Side,
  requestedDeg: number,
  wear: WristWear,
): KinematicArmTruth {
  const strides = steadyStrides(schedule, side === "left" ? "right" : "left");
  const swinging = arm.ratio !== 0 && !arm.heldStill && arm.rangeDeg > 0;
  const ranges: number[] = [];
  const rate: number[] = [];
  const angle: number[] = [];
  for (const s of strides) {
    if (swinging) {
      const ph = strideRelativePhaseDeg(model, side, arm.ratio as 1 | 2, s.icS, s.nextIcS);
      rate.push(ph.rate);
      angle.push(ph.angle);
    }
    const n = swinging ? arm.ratio : 1;
    for (let k = 0; k < n; k++) {
      const d = (s.nextIcS - s.icS) / n;
      ranges.push(armRangeDeg(model, side, s.icS + k * d, s.icS + (k + 1) * d));
    }
  }
  const sagittalSign = wear === "standard" ? 1 : -1;
  return {
    side,
    ratio: swinging ? (arm.ratio as 1 | 2) : null,
    relativePhaseDeg: swinging && angle.length ? circularMeanDeg(angle) : null,
    relativePhaseRateDeg: swinging && rate.length ? circularMeanDeg(rate) : null,
    requestedRelativePhaseDeg: swinging ? requestedDeg : null,
    swingRangeDeg: ranges.length ? ranges.reduce((a, b) => a + b, 0) / ranges.length : 0,
    swingRangesDeg: ranges,
    cycles: strides.length,
    wear,
    sagittalSign,
    heldStill: arm.heldStill,
  };
}

function pauseInside(pauses: readonly Bout[], a: number, b: number): number {
  let s = 0;
  for (const p of pauses) s += Math.max(0, Math.min(b, p.endS) - Math.max(a, p.startS));
  return s;
}

/**
 * Walking speed per stride from the stance kinematics: while a foot is planted, the pelvis travels the
 * change of that leg's horizontal hip-to-ankle reach between IC and FC, over the stance time.
 */
function strideSpeedsMPerS(schedule: GaitSchedule, probe: BodyModel, footM: number): PerSide<number[]> {
  const out: PerSide<number[]> = { left: [], right: [] };
  for (const side of SIDES) {
    for (const s of schedule[side].strides) {
      const r = romAtTime(schedule, s.icS);
      const reach = probe.reachM(side, 0, r) - probe.reachM(side, NORMATIVE_STANCE_FRACTION, r) + rolloverM(probe, side, r, footM);
      const stance = s.fcS - s.icS - pauseInside(schedule.hesitations, s.icS, s.fcS);
      out[side].push(reach / stance);
    }
  }
  return out;
}

/**
 * Forward travel of the ankle over the heel and forefoot rockers (Perry & Burnfield 2010): the ankle
 * sits ≈ 0.2 of the foot length ahead of the heel and ≈ 0.6 behind the metatarsal heads (approximation),
 * so pitching the foot by φ about a contact point moves it by l·(1 − cos φ).
 */
function rolloverM(probe: BodyModel, side: Side, r: number, footM: number): number {
  const pitch = (q: number) => (probe.footPitchAtPhaseDeg(side, q, r) * Math.PI) / 180;
  return 0.2 * footM * (1 - Math.cos(pitch(0))) + 0.6 * footM * (1 - Math.cos(pitch(NORMATIVE_STANCE_FRACTION)));
}

function romAtTime(schedule: GaitSchedule, t: number): number {
  const k = schedule.rom;
  let i = 0;
  while (i + 1 < k.t.length && k.t[i + 1]! <= t) i++;
  return k.v[i] ?? 1;
}

/**
 * Pelvis forward travel as a function of the step clock: each step adds the stance leg's speed × the
 * step's walking time; surge (speed ± 10 % at the step frequency, fastest at IC: braking after each IC,
 * propulsion before the next) and vertical excursion (lowest at IC; compass-gait height change × 0.35)
 * are approximations after the inverted-pendulum description of walking (Saunders, Inman & Eberhart 1953).
 */
function pelvisTravel(schedule: GaitSchedule, probe: BodyModel, speeds: PerSide<number[]>, legM: number) {
  const travel: PhaseKnots = { t: [], v: [] };
  const surge: PhaseKnots = { t: [], v: [] };
  const bob: PhaseKnots = { t: [], v: [] };
  let distance = 0;
  const push = (k: PhaseKnots, x: number, v: number) => {
    if (k.t.length && x <= k.t[k.t.length - 1]!) return;
    k.t.push(x);
    k.v.push(v);
  };
  schedule.spans.forEach((span, b) => {
    const ics: { t: number; side: Side; speed: number }[] = [];
    for (const side of SIDES) {
      const strides = schedule[side].strides;
      for (let i = 0; i < strides.length; i++) {
        if (strides[i]!.boutIndex === b) ics.push({ t: strides[i]!.icS, side, speed: speeds[side][i]! });
      }
      const last = [...strides].reverse().find((s) => s.boutIndex === b);
      const lastIdx = last ? strides.indexOf(last) : -1;
      if (last) ics.push({ t: last.nextIcS, side, speed: speeds[side][lastIdx]! });
    }
    ics.sort((x, y) => x.t - y.t);
    const first = ics[0]!;
    const startPhase = probe.stepPhase(span.startS);
    const add = (x: number, step: number, speed: number) => {
      const stepLengthM = speed * step;
      push(travel, x, distance);
      push(surge, x, (0.1 * speed * step) / (2 * Math.PI));
      const half = Math.min(0.9 * legM, stepLengthM / 2);
      push(bob, x, 0.35 * (legM - Math.sqrt(legM * legM - half * half)));
    };
    add(startPhase, ics[1]!.t - first.t, first.speed);
    distance += 0.5 * first.speed * (first.t - span.startS);
    for (let j = 0; j < ics.length; j++) {
      const here = ics[j]!;
      const next = ics[j + 1];
      const step = next ? next.t - here.t - pauseInside(schedule.hesitations, here.t, next.t) : ics[j]!.t - ics[j - 1]!.t;
      add(probe.stepPhase(here.t), step, here.speed);
      if (next) distance += here.speed * step;
    }
    distance += 0.1 * ics[ics.length - 1]!.speed * 0.3;
    push(travel, probe.stepPhase(span.endS + 0.5), distance);
    push(surge, probe.stepPhase(span.endS + 0.5), surge.v[surge.v.length - 1]!);
    push(bob, probe.stepPhase(span.endS + 0.5), bob.v[bob.v.length - 1]!);
  });
  return { pelvisTravel: travel, surgeM: surge, bobM: bob };
}

/** Four slow sinusoids (0.15–0.6 Hz) whose rate has the requested SD (deg/s): quiet-standing sway. */
function slowSway(sdDegS: number, prng: Prng): Sway {
  const frequenciesHz = [0.15, 0.27, 0.41, 0.6].map((f) => f * (0.9 + 0.2 * prng.uniform()));
  const each = sdDegS * Math.sqrt(2 / frequenciesHz.length);
  return {
    frequenciesHz,
    amplitudesDeg: frequenciesHz.map((f) => each / (2 * Math.PI * f)),
    phasesRad: frequenciesHz.map(() => 2 * Math.PI * prng.uniform()),
  };
}

/** Ripple bursts on a shank: after each IC of its leg, and in half of the swings (10–20 Hz, 0.12–0.2 s). */
function rippleBursts(schedule: GaitSchedule, side: Side, peakDegS: number, prng: Prng): RippleBurst[] {
  if (peakDegS === 0) return [];
  const out: RippleBurst[] = [];
  const burst = (startS: number) => ({
    startS,
    durationS: 0.12 + 0.08 * prng.uniform(),
    frequencyHz: 10 + 10 * prng.uniform(),
    peakDegS: peakDegS * (0.6 + 0.4 * prng.uniform()),
  });
  for (const t of schedule[side].ic) out.push(burst(t + 0.01));
  for (const s of schedule[side].strides) if (prng.uniform() < 0.5) out.push(burst(s.fcS + 0.3 * (s.nextIcS - s.fcS)));
  return out.sort((a, b) => a.startS - b.startS);
}

function standingSpans(schedule: GaitSchedule, durationS: number): Bout[] {
  const out: Bout[] = [];
  let from = 0;
  for (const s of schedule.spans) {
    out.push({ startS: from, endS: s.startS });
    from = s.endS;
  }
  out.push({ startS: from, endS: durationS });
  return out;
}

function summarise(left: KinematicLegTruth, right: KinematicLegTruth): KinematicSummaryTruth {
  const steady = (l: KinematicLegTruth) => l.strides.filter((s) => !s.boutEdge && !s.containsPause);
  const both = [...steady(left), ...steady(right)];
  const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;
  const times = both.map((s) => s.strideTimeS);
  const m = mean(times);
  const sd = Math.sqrt(times.reduce((a, b) => a + (b - m) ** 2, 0) / Math.max(1, times.length - 1));
  const stance = (l: KinematicLegTruth) => mean(steady(l).map((s) => s.stancePct));
  // Double support per left stride: (FC_R − IC_L) + (FC_L − IC_R) over the stride.
  const ds: number[] = [];
  for (const s of steady(left)) {
    const fcR = right.fc.find((t) => t > s.icS && t < s.nextIcS);
    const icR = right.ic.find((t) => t > s.icS && t < s.nextIcS);
    if (fcR === undefined || icR === undefined) continue;
    ds.push((100 * (fcR - s.icS + (s.fcS - icR))) / s.strideTimeS);
  }
  const lengthM = mean(both.map((s) => s.strideLengthM));
  return {
    strideCount: both.length,
    cadenceStepsPerMin: 120 / m,
    strideTimeMeanS: m,
    strideTimeCvPct: (100 * sd) / m,
    stancePct: { left: stance(left), right: stance(right) },
    swingPct: { left: 100 - stance(left), right: 100 - stance(right) },
    doubleSupportPct: mean(ds),
    walkingSpeedMPerS: mean(both.map((s) => s.walkingSpeedMPerS)),
    strideLengthM: lengthM,
  };
}
