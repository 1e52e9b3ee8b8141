import { boutsToMask, detectWalkingMask, maskToBouts } from "./activity/walking-bouts";
import { detectTurns, yawRateAboutGravity } from "./activity/turns";
import { type WalkingAid, sessionArms } from "./coordination/session-arms";
import { detectFootEvents } from "./gait/detect-foot-events";
import { detectShankEvents } from "./gait/detect-shank-events";
import { longestConsecutiveRun } from "./gait/consecutive-strides";
import { dfaAlphaOrReason } from "./gait/dfa";
import type { LegEvents } from "./gait/gait-events";
import { phaseCoordinationIndex } from "./gait/phase-coordination-index";
import { strideMetrics } from "./gait/stride-metrics";
import { buildSessionStrides } from "./gait/strides";
import { describeExcludedStrides } from "./gait/excluded-strides";
import { detectInvertedFoot, detectInvertedShank } from "./orientation/detect-inverted-segment";
import { type SagittalAxis, projectOnAxis, sagittalAxis } from "./orientation/sagittal-axis";
import { sagittalSignals } from "./orientation/sagittal-signals";
import { SATURATION_FLOOR_ACC_M_S2, SATURATION_FLOOR_GYRO_DEG_S, countSaturatedSamples } from "./quality/saturation";
import { shankSwingAxisCheck } from "./quality/shank-swing-axis";
import { MIN_STEADY_STRIDES_FOR_VARIABILITY, MISALIGNMENT_INFO_DEG, RATE_MISMATCH_FRACTION } from "./quality/thresholds";
import { alignLegClocks } from "./timebase/align-clocks";
import { alignWristClocks } from "./timebase/align-wrist-clocks";
import { type ResampledSensor, resampleToGrid } from "./timebase/resample-to-grid";
import { sessionGrid } from "./timebase/session-grid";
import { sessionStrideLengths } from "./spatial/session-stride-lengths";
import { walkingSpeedFromStrides } from "./spatial/walking-speed";
import {
  type Analysis,
  type ArmLegCoupling,
  type Bout,
  type Placement,
  type QualityItem,
  type SensorRecording,
  type Side,
  SignalInputError,
} from "./types";

/** Bumped whenever a change can alter any number in the output. */
export const ALGORITHM_VERSION = "1.4.0";

export interface AnalyzeOptions {
  /** Reserved for callers that want to skip the arm–leg step (e.g. a quick pre-check). */
  skipArmLeg?: boolean;
  /** Patient's standing height (cm, 100–230) for spatial methods that scale with body size. */
  heightCm?: number;
  /** Walking aid used in this session (recorded by the clinician); any aid but "none" withholds arm–leg coupling. */
  walkingAid?: WalkingAid;
  /** Also return each sensor's sagittal angular velocity and orientation decisions (`Analysis.sagittal`), e.g. for charts. */
  sagittalSignals?: boolean;
}

const NO_COUPLING: ArmLegCoupling = { frequencyRatio: null, meanRelativePhaseDeg: null, couplingStrength: null, circularSdDeg: null, reason: "arm analysis skipped" };

interface LegSignal {
  side: Side;
  placement: Placement;
  omega: Float64Array;
  events: LegEvents;
  axis: SagittalAxis;
  inverted: boolean;
}

/**
 * The one analysis pipeline (CLI, worker and portal pre-check all call it): time base → resampling →
 * walking bouts → sagittal axes and inversion → events → turns → strides → metrics → quality.
 * Pure: no I/O, no clocks. Placement comes from each recording (the server sets it from device
 * assignments); recordings without one are reported and left out.
 */
export function analyze(recordings: readonly SensorRecording[], options: AnalyzeOptions = {}): Analysis {
  if (!Array.isArray(recordings) || recordings.length === 0) throw new SignalInputError("no recordings to analyse");
  const h = options.heightCm;
  if (h !== undefined && !(Number.isFinite(h) && h >= 100 && h <= 230)) throw new SignalInputError(`height ${h} cm is outside 100–230 cm`);
  const quality: QualityItem[] = [];
  const placed: SensorRecording[] = [];
  const seen = new Map<Placement, string>();
  for (const r of recordings) {
    if (r.placement === null) {
      quality.push({ code: "missing-placement", severity: "warning", message: `${r.fileName} (device ${r.deviceSerial}) has no placement; it was not analysed` });
      continue;
    }
    const other = seen.get(r.placement);
    if (other) throw new SignalInputError(`${r.fileName}: placement ${r.placement} is also given by ${other}`, r.fileName);
    seen.set(r.placement, r.fileName);
    placed.push(r);
  }
  const grid = sessionGrid(recordings);
  const fs = grid.sampleRateHz;
  const n = grid.length;
  const sensors = new Map<Placement, ResampledSensor>();
  for (const r of placed) {
    const s = resampleToGrid(r, grid, recordings.indexOf(r));
    sensors.set(r.placement!, s);
    reportRecordingQuality(r, s, quality);
  }
  // Clock alignment of the right leg sensor to the left one (impacts felt by the trunk or wrists),
  // then of each wrist to the legs (the impacts it feels against the legs' combined train).
  const legClocks = alignLegClocks(placed, grid, sensors, recordings);
  quality.push(...legClocks.quality);
  quality.push(...alignWristClocks(placed, grid, sensors, recordings, legClocks).quality);

  const legPlacement = (side: Side): Placement | null => {
    const shank = `${side}_shank` as Placement;
    const foot = `${side}_foot` as Placement;
    return sensors.has(shank) ? shank : sensors.has(foot) ? foot : null;
  };
  const legSensors = (["left_shank", "right_shank", "left_foot", "right_foot"] as const).filter((p) => sensors.has(p)).map((p) => sensors.get(p)!);
  for (const side of ["left", "right"] as const) {
    if (!legPlacement(side)) {
      quality.push({ code: "missing-placement", severity: "warning", message: `no ${side} shank or foot sensor: ${side} events and left–right metrics are unavailable` });
    }
  }

  // Walking bouts from all leg sensors.
  const walking = detectWalkingMask(
    legSensors.map((s) => ({ x: s.gyroX, y: s.gyroY, z: s.gyroZ, valid: s.valid })),
    fs,
    n,
  );
  const bouts = maskToBouts(walking, fs);
  const boutMask = boutsToMask(bouts, fs, n);

  // Invalid spans: long gaps in the leg sensors. Short interpolated gaps keep their events, but
  // strides across them are left out of the steady-state metrics (excludedReason "gap").
  const invalidSpans: Bout[] = mergeSpans(legSensors.flatMap((s) => s.invalidSpans));
  const gapSpans: Bout[] = mergeSpans(legSensors.flatMap((s) => s.gaps.filter((g) => g.interpolated).map((g) => ({ startS: g.startS, endS: g.endS }))));

  // Events per leg.
  const legs: Partial<Record<Side, LegSignal>> = {};
  const unreliableSides: Side[] = [];
  for (const side of ["left", "right"] as const) {
    const placement = legPlacement(side);
    if (!placement) continue;
    const s = sensors.get(placement)!;
    const mask = andMask(boutMask, s.valid);
    const axis = sagittalAxis(s.gyroX, s.gyroY, s.gyroZ, mask);
    if (!axis) continue;
    if (axis.angleFromNominalDeg > MISALIGNMENT_INFO_DEG) {
      quality.push({ code: "misalignment", severity: "info", placement, message: `${placement} sagittal axis is ${axis.angleFromNominalDeg.toFixed(0)}° from the nominal +z axis; corrected from the walking data` });
    }
    const isFoot = placement.endsWith("_foot");
    const swingAxis = isFoot ? null : shankSwingAxisCheck(s.accX, s.accY, s.accZ, axis.axis, mask);
    if (swingAxis && !swingAxis.plausible) {
      unreliableSides.push(side);
      quality.push({
        code: "misalignment",
        severity: "warning",
        placement,
        message: `${placement}: the main rotation is ${swingAxis.angleToLongAxisDeg!.toFixed(0)}° from the lower leg's long axis instead of about 90° (loose or rotated strap?); ${placement.replace("_shank", "")} events and left–right metrics from this sensor are unreliable — check the strap before the next walk`,
      });
    }
    const omega = projectOnAxis(s.gyroX, s.gyroY, s.gyroZ, axis.axis);
    const inversion = isFoot ? detectInvertedFoot(omega, mask) : detectInvertedShank(omega, mask);
    if (inversion.inverted) {
      for (let i = 0; i < omega.length; i++) omega[i] = -omega[i]!;
      quality.push({ code: "inverted-sensor", severity: "warning", placement, message: `${placement} appears to be worn upside down or back to front (swing rotation has the wrong sign); the signal was inverted before analysis` });
    }
    const events = isFoot ? detectFootEvents(omega, mask, fs) : detectShankEvents(omega, mask, fs, s);
    legs[side] = { side, placement, omega, events, axis, inverted: inversion.inverted };
  }

  // Turns: lower back when worn (cleanest yaw), else the mean over the leg sensors.
  const back = sensors.get("lower_back");
  const yawSources = back ? [back] : legSensors;
  let turns: Bout[] = [];
  if (yawSources.length > 0) {
    const traces = yawSources.map((s) => yawRateAboutGravity(s, fs));
    const m = traces[0]!.yawDegS.length;
    const yaw = new Float64Array(m);
    const count = new Uint8Array(m);
    for (const tr of traces) {
      for (let i = 0; i < m; i++) if (tr.valid[i]) {
        yaw[i]! += tr.yawDegS[i]!;
        count[i]!++;
      }
    }
    for (let i = 0; i < m; i++) if (count[i]! > 1) yaw[i]! /= count[i]!;
    turns = detectTurns(yaw, traces[0]!.sampleRateHz).map((t) => ({ startS: t.startS, endS: t.endS }));
  }

  // Strides: per-leg checks, then the session-relative steady-state gate (gait/strides.ts).
  const strides = buildSessionStrides(legs.left?.events ?? null, legs.right?.events ?? null, { bouts, turns, invalidSpans, gapSpans, unreliableSides });
  const excludedItem = describeExcludedStrides(strides);
  if (excludedItem) quality.push({ code: "strides-excluded", severity: "info", message: excludedItem });
  const order = strides.filter((s) => s.excludedReason === "event-order").length;
  if (order > 0) {
    quality.push({ code: "event-order", severity: "info", message: `${order} stride(s) left out because their initial contacts did not alternate plausibly between the legs (opening step outside 15–85 % of the stride)` });
  }
  const fcRejected = strides.filter((s) => s.steady && s.finalContactRejected);
  if (fcRejected.length > 0) {
    const steadyCount = strides.filter((s) => s.steady).length;
    quality.push({
      code: "event-order",
      severity: fcRejected.length > 0.5 * steadyCount ? "warning" : "info",
      message: `${fcRejected.length} of ${steadyCount} steady stride(s) have no usable final contact (missing, or not in the order IC < FC(other) < IC(other) < FC < next IC): they count for cadence, stride time and PCI but not for stance, swing or double support`,
    });
  }

  const base = strideMetrics(strides);
  const steady = strides.filter((s) => s.steady);

  // Stride length and walking speed (spatial/): per side the foot sensor when worn, else the shank.
  const spatial = sessionStrideLengths(
    {
      left: { shank: sensors.get("left_shank"), foot: sensors.get("left_foot") },
      right: { shank: sensors.get("right_shank"), foot: sensors.get("right_foot") },
    },
    strides,
    { left: legs.left?.events.finalContactsS ?? [], right: legs.right?.events.finalContactsS ?? [] },
    boutMask,
    { sampleRateHz: fs, heightCm: options.heightCm },
  );
  spatial.lengthsM.forEach((len, i) => {
    strides[i]!.strideLengthM = len;
  });
  const speed = walkingSpeedFromStrides(strides, spatial.rejected, spatial.notes);
  if (speed.walkingSpeedMPerS === null && strides.length > 0) {
    quality.push({ code: "speed-unavailable", severity: "info", message: `walking speed and stride length not computed: ${speed.reason}` });
  }

  // PCI: reference leg = longer mean swing time (Plotnik 2007).
  let pci: number | null = null;
  let pciPhases = 0;
  const swL = base.swingTimeMeanS.left;
  const swR = base.swingTimeMeanS.right;
  if (swL !== null && swR !== null && legs.left && legs.right) {
    const ref: Side = swL >= swR ? "left" : "right";
    const other = legs[ref === "left" ? "right" : "left"]!;
    const r = phaseCoordinationIndex(steady.filter((s) => s.side === ref), other.events.initialContactsS);
    pci = r?.pciPct ?? null;
    pciPhases = r?.phiDeg.length ?? 0;
  }

  // DFA over the longest run of consecutive steady strides of one leg in one bout (never joined
  // across pauses, turns or excluded strides).
  const run = longestConsecutiveRun(strides);
  const dfa = dfaAlphaOrReason(run?.strideTimesS ?? []);
  if (dfa.alpha === null && base.steadyStrideCount > 0) {
    quality.push({ code: "dfa-unavailable", severity: "info", message: `DFA α not computed: ${dfa.reason}` });
  }

  // Arm swing and arm–leg coordination over straight steady walking (signal/docs/arm-leg-coordination.md).
  const strideFrequencyHz = base.strideTimeMeanS ? 1 / base.strideTimeMeanS : Number.NaN;
  const legOf = (side: Side) => (legs[side] ? { omegaDegS: legs[side]!.omega, initialContactsS: legs[side]!.events.initialContactsS } : undefined);
  const arms = options.skipArmLeg
    ? { armLeg: { leftArmRightLeg: { ...NO_COUPLING }, rightArmLeftLeg: { ...NO_COUPLING } }, armSwing: null, armSwingReason: "arm analysis skipped", counts: {}, quality: [], signCorrected: [] }
    : sessionArms({
        wrists: { left: sensors.get("left_wrist"), right: sensors.get("right_wrist") },
        legs: { left: legOf("left"), right: legOf("right") },
        sampleRateHz: fs,
        strideFrequencyHz,
        steadyStrides: steady,
        turns,
        walkingAid: options.walkingAid,
      });
  quality.push(...arms.quality);

  if (bouts.length === 0 || strides.length === 0) {
    quality.push({ code: "no-walking", severity: "error", message: "no walking was found in this session; no gait metrics were computed" });
  } else if (base.steadyStrideCount < MIN_STEADY_STRIDES_FOR_VARIABILITY) {
    quality.push({
      code: "few-strides",
      severity: "warning",
      message: `only ${base.steadyStrideCount} steady-state strides; variability (CV, PCI) needs at least ${MIN_STEADY_STRIDES_FOR_VARIABILITY} steps (Galna et al. 2013; Kroneberg et al. 2019) — interpret with caution`,
    });
  }

  const eventsOf = (side: Side) => ({
    initialContacts: legs[side]?.events.initialContactsS ?? [],
    finalContacts: legs[side]?.events.finalContactsS ?? [],
    midSwings: legs[side]?.events.midSwingsS ?? [],
  });

  return {
    session: {
      startUtc: grid.startUtc,
      durationS: grid.durationS,
      sampleRateHz: fs,
      placements: [...sensors.keys()],
    },
    events: { left: eventsOf("left"), right: eventsOf("right") },
    strides,
    bouts,
    turns,
    invalidSpans,
    metrics: {
      steadyStrideCount: base.steadyStrideCount,
      cadenceStepsPerMin: base.cadenceStepsPerMin,
      strideTimeMeanS: base.strideTimeMeanS,
      strideTimeCvPct: base.strideTimeCvPct,
      stepTimeMeanS: base.stepTimeMeanS,
      stancePct: base.stancePct,
      swingPct: base.swingPct,
      doubleSupportPct: base.doubleSupportPct,
      phaseCoordinationIndexPct: pci,
      gaitAsymmetryPct: base.gaitAsymmetryPct,
      dfaAlpha: dfa.alpha,
      dfaAlphaReason: dfa.reason,
      dfaAlphaUncertainty: dfa.uncertainty,
      walkingSpeedMPerS: speed.walkingSpeedMPerS,
      strideLengthM: speed.strideLengthM,
      walkingSpeedReason: speed.reason,
      swingTimeCvPct: base.swingTimeCvPct,
      stepTimeAsymmetryPct: base.stepTimeAsymmetryPct,
      armSwing: arms.armSwing,
      armSwingReason: arms.armSwingReason,
      counts: { ...base.counts, phaseCoordinationIndexPct: pciPhases, dfaAlpha: dfa.strideCount, walkingSpeedMPerS: speed.strideCount, strideLengthM: speed.strideCount, ...arms.counts },
      armLeg: arms.armLeg,
    },
    quality,
    algorithm: { version: ALGORITHM_VERSION },
    ...(options.sagittalSignals
      ? { sagittal: sagittalSignals({ sensors, sampleRateHz: fs, boutMask, legs: Object.values(legs), invertedElsewhere: new Set(arms.signCorrected) }) }
      : {}),
  };
}

function reportRecordingQuality(r: SensorRecording, s: ResampledSensor, quality: QualityItem[]): void {
  const placement = r.placement!;
  const short = s.gaps.filter((g) => g.interpolated);
  if (short.length > 0) {
    const total = short.reduce((a, g) => a + g.endS - g.startS, 0);
    const longest = Math.max(...short.map((g) => g.endS - g.startS));
    quality.push({
      code: "gap",
      severity: "info",
      placement,
      message: `${r.fileName}: ${short.length} short gap(s) (≤ 150 ms, longest ${(longest * 1000).toFixed(0)} ms, ${total.toFixed(2)} s in total) were interpolated`,
      startS: short[0]!.startS,
      endS: short[short.length - 1]!.endS,
    });
  }
  for (const span of s.invalidSpans) {
    quality.push({
      code: "invalid-span",
      severity: "warning",
      placement,
      message: `${r.fileName}: ${(span.endS - span.startS).toFixed(2)} s without data; no events or strides there`,
      startS: span.startS,
      endS: span.endS,
    });
  }
  const mismatch = Math.abs(s.effectiveSampleRateHz - r.nominalSampleRateHz) / r.nominalSampleRateHz;
  if (mismatch > RATE_MISMATCH_FRACTION) {
    quality.push({
      code: "rate-mismatch",
      severity: "warning",
      placement,
      message: `${r.fileName}: effective sampling rate ${s.effectiveSampleRateHz.toFixed(1)} Hz differs from the nominal ${r.nominalSampleRateHz} Hz by ${(100 * mismatch).toFixed(1)} %`,
    });
  }
  const channels: Array<[string, ArrayLike<number>, number]> = [
    ["gyro_x", r.gyroX, SATURATION_FLOOR_GYRO_DEG_S],
    ["gyro_y", r.gyroY, SATURATION_FLOOR_GYRO_DEG_S],
    ["gyro_z", r.gyroZ, SATURATION_FLOOR_GYRO_DEG_S],
    ["acc_x", r.accX, SATURATION_FLOOR_ACC_M_S2],
    ["acc_y", r.accY, SATURATION_FLOOR_ACC_M_S2],
    ["acc_z", r.accZ, SATURATION_FLOOR_ACC_M_S2],
  ];
  const clipped = channels.map(([name, x, floor]) => [name, countSaturatedSamples(x, floor)] as const).filter(([, c]) => c > 0);
  if (clipped.length > 0) {
    quality.push({
      code: "saturation",
      severity: "warning",
      placement,
      message: `${r.fileName}: flat-topped samples at the sensor's range (${clipped.map(([nm, c]) => `${nm} ${c}`).join(", ")}); peaks there are clipped`,
    });
  }
}

function andMask(a: Uint8Array, b: Uint8Array): Uint8Array {
  const out = new Uint8Array(a.length);
  for (let i = 0; i < a.length; i++) out[i] = a[i]! & b[i]!;
  return out;
}

function mergeSpans(spans: Bout[]): Bout[] {
  const sorted = [...spans].sort((a, b) => a.startS - b.startS);
  const out: Bout[] = [];
  for (const s of sorted) {
    const last = out[out.length - 1];
    if (last && s.startS <= last.endS) last.endS = Math.max(last.endS, s.endS);
    else out.push({ ...s });
  }
  return out;
}
