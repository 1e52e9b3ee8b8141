import { boutsToMask, detectWalkingMask, maskToBouts } from "./activity/walking-bouts";
import { sessionTurns } from "./activity/session-turns";
import { type WalkingAid, sessionArms } from "./coordination/session-arms";
import { type LegSignal, legSignal } from "./gait/leg-signals";
import { sessionDfa } from "./gait/session-dfa";
import { sessionPci } from "./gait/session-pci";
import { strideMetrics } from "./gait/stride-metrics";
import { buildSessionStrides } from "./gait/strides";
import { sagittalSignals } from "./orientation/sagittal-signals";
import { recordingQuality } from "./quality/recording-quality";
import { strideQuality, walkingAmountQuality } from "./quality/stride-quality";
import { alignLegClocks } from "./timebase/align-clocks";
import { alignWristClocks } from "./timebase/align-wrist-clocks";
import { type ResampledSensor, resampleToGrid } from "./timebase/resample-to-grid";
import { sessionGrid } from "./timebase/session-grid";
import { sessionWalkingSpeed } from "./spatial/session-walking-speed";
import { type Analysis, type ArmLegCoupling, type Bout, type Placement, type QualityItem, type SensorRecording, type Side, SignalInputError } from "./types";

/** Bumped whenever a change can alter any number in the output. */
export const ALGORITHM_VERSION = "1.4.1";

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
  const placed = placedRecordings(recordings, quality);
  const grid = sessionGrid(recordings);
  const fs = grid.sampleRateHz;
  const n = grid.length;
  const sensors = new Map<Placement, ResampledSensor>();
  for (const r of placed) {
    const s = resampleToGrid(r, grid, recordings.indexOf(r));
    sensors.set(r.placement!, s);
    quality.push(...recordingQuality(r, s));
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

  // Sagittal angular velocity and events per leg.
  const legs: Partial<Record<Side, LegSignal>> = {};
  const unreliableSides: Side[] = [];
  for (const side of ["left", "right"] as const) {
    const placement = legPlacement(side);
    if (!placement) continue;
    const outcome = legSignal(side, placement, sensors.get(placement)!, boutMask, fs);
    quality.push(...outcome.quality);
    if (outcome.unreliable) unreliableSides.push(side);
    if (outcome.leg) legs[side] = outcome.leg;
  }

  // Turns: lower back when worn (cleanest yaw), else the mean over the leg sensors.
  const turns = sessionTurns(sensors.get("lower_back"), legSensors, fs);

  // Strides: per-leg checks, then the session-relative steady-state gate (gait/strides.ts).
  const strides = buildSessionStrides(legs.left?.events ?? null, legs.right?.events ?? null, { bouts, turns, invalidSpans, gapSpans, unreliableSides });
  quality.push(...strideQuality(strides));

  const base = strideMetrics(strides);
  const steady = strides.filter((s) => s.steady);

  // Stride length and walking speed (spatial/): per side the foot sensor when worn, else the shank.
  const finalContactsS = { left: legs.left?.events.finalContactsS ?? [], right: legs.right?.events.finalContactsS ?? [] };
  const { speed, quality: speedNote } = sessionWalkingSpeed(sensors, strides, finalContactsS, boutMask, fs, options.heightCm);
  if (speedNote) quality.push(speedNote);

  // PCI against the leg with the longer mean swing time; DFA over one unbroken run of strides.
  const pci = sessionPci(base.swingTimeMeanS, steady, { left: legs.left?.events.initialContactsS ?? null, right: legs.right?.events.initialContactsS ?? null });
  const dfa = sessionDfa(strides);
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

  const walkingAmount = walkingAmountQuality(bouts.length, strides.length, base.steadyStrideCount);
  if (walkingAmount) quality.push(walkingAmount);

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
      phaseCoordinationIndexPct: pci.pciPct,
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
      counts: { ...base.counts, phaseCoordinationIndexPct: pci.phaseCount, dfaAlpha: dfa.strideCount, walkingSpeedMPerS: speed.strideCount, strideLengthM: speed.strideCount, ...arms.counts },
      armLeg: arms.armLeg,
    },
    quality,
    algorithm: { version: ALGORITHM_VERSION },
    ...(options.sagittalSignals
      ? { sagittal: sagittalSignals({ sensors, sampleRateHz: fs, boutMask, legs: Object.values(legs), invertedElsewhere: new Set(arms.signCorrected) }) }
      : {}),
  };
}

/** Recordings with a placement, in input order; one without is reported and left out, the same placement twice is refused. */
function placedRecordings(recordings: readonly SensorRecording[], quality: QualityItem[]): SensorRecording[] {
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
  return placed;
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
