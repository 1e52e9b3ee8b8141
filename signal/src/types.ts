// The shapes every consumer of the analysis shares: the CLI prints `Analysis`, the worker stores it,
// the portal draws it. Times are seconds on the session time base (0 = earliest start_utc).

export const PLACEMENTS = [
  "left_shank",
  "right_shank",
  "left_wrist",
  "right_wrist",
  "left_foot",
  "right_foot",
  "lower_back",
] as const;
export type Placement = (typeof PLACEMENTS)[number];

export type Side = "left" | "right";

/** One worn device's recording, as read from a sensor CSV v1 or BIDS Motion file. */
export interface SensorRecording {
  /** File name (no directories) used in every message about this recording. */
  fileName: string;
  deviceSerial: string;
  /** From the file header when present; the server may override it from device assignments. */
  placement: Placement | null;
  nominalSampleRateHz: number;
  /** ISO 8601 UTC, millisecond precision. */
  startUtc: string;
  /** Seconds since this file's own first sample clock (as written in the file). */
  timeS: Float64Array;
  /** m/s², sensor frame, gravity included. */
  accX: Float32Array;
  accY: Float32Array;
  accZ: Float32Array;
  /** deg/s, always (rad/s input is converted on read). */
  gyroX: Float32Array;
  gyroY: Float32Array;
  gyroZ: Float32Array;
}

export type QualityCode =
  | "gap"
  | "invalid-span"
  | "saturation"
  | "inverted-sensor"
  | "rate-mismatch"
  | "few-strides"
  | "missing-placement"
  | "no-walking"
  | "misalignment"
  | "dfa-unavailable"
  | "event-order"
  /** Strides left out of the steady-state set, counted by reason (slow or irregular walks show it). */
  | "strides-excluded"
  /** Sensor clock offset between sensors estimated from shared impacts and corrected (> 20 ms). */
  | "clock-offset"
  /** The data could not confirm the sensors' relative clock alignment. */
  | "clock-unverified"
  /** Walking speed / stride length could not be computed (reason in the message). */
  | "speed-unavailable"
  /** A wrist sensor's sagittal sign could not be decided from physical cues. */
  | "arm-sign-unverified"
  /** Left and right wrist (or leg) sensors appear to be swapped. */
  | "placement-swap"
  /** No measurable arm swing on one or both arms (or a walking aid): coupling not reported. */
  | "no-arm-swing";

export interface QualityItem {
  code: QualityCode;
  severity: "info" | "warning" | "error";
  placement?: Placement;
  message: string;
  /** Optional span on the session time base the item refers to. */
  startS?: number;
  endS?: number;
}

export interface Stride {
  side: Side;
  /** IC that opens the stride and the next same-side IC that closes it. */
  icS: number;
  nextIcS: number;
  /** FC of this side between icS and nextIcS (toe-off ending stance). */
  fcS: number | null;
  strideTimeS: number;
  stanceTimeS: number | null;
  swingTimeS: number | null;
  stancePct: number | null;
  swingPct: number | null;
  doubleSupportPct: number | null;
  /** This stride's opening step: icS minus the preceding contralateral IC (null when not found). */
  stepTimeS?: number | null;
  /** Included in the steady-state metrics (not near a turn, not first/last of a bout, no gap). */
  steady: boolean;
  /** Why a stride was left out of the steady-state set, when it was. */
  excludedReason?: "bout-edge" | "turn" | "invalid-span" | "out-of-range" | "event-order" | "gap" | "unsteady" | "unreliable-sensor";
  /**
   * True when the stride's ICs alternate plausibly but its FC was missing or out of order: the
   * stride keeps its timing (cadence, stride time, PCI) and has no stance, swing or double support.
   */
  finalContactRejected?: boolean;
  /** Stride length (m) for this stride when a spatial method could compute it. */
  strideLengthM?: number | null;
  /** Index of the continuous walking bout (0-based) the stride lies in; -1 when in none. */
  boutIndex?: number;
}

export interface ArmLegCoupling {
  /** 1 or 2 when within 15 % of it, else the measured arm-cycles-per-stride value; null when not computable. */
  frequencyRatio: number | null;
  meanRelativePhaseDeg: number | null;
  /** Mean resultant length R of the n:m relative phase, 0..1. */
  couplingStrength: number | null;
  circularSdDeg: number | null;
  /** Why meanRelativePhaseDeg / couplingStrength are null, when they are. */
  reason?: string | null;
}

/** Sagittal arm swing per arm (range of motion per arm cycle, degrees) and the left–right asymmetry. */
export interface ArmSwing {
  left: { amplitudeDeg: number | null };
  right: { amplitudeDeg: number | null };
  /** Arm swing asymmetry index (%), definition and source in signal/docs. */
  asymmetryPct: number | null;
}

/**
 * One sensor's six channels on the session grid (acceleration in m/s² with gravity, angular velocity
 * in deg/s, sensor frame) and its validity mask: what every step after resampling reads.
 */
export interface ImuSignals {
  accX: ArrayLike<number>;
  accY: ArrayLike<number>;
  accZ: ArrayLike<number>;
  gyroX: ArrayLike<number>;
  gyroY: ArrayLike<number>;
  gyroZ: ArrayLike<number>;
  valid: Uint8Array;
}

export interface PerSide<T> {
  left: T;
  right: T;
}

export interface Metrics {
  steadyStrideCount: number;
  cadenceStepsPerMin: number | null;
  strideTimeMeanS: number | null;
  strideTimeCvPct: number | null;
  stepTimeMeanS: PerSide<number | null>;
  stancePct: PerSide<number | null>;
  swingPct: PerSide<number | null>;
  doubleSupportPct: number | null;
  phaseCoordinationIndexPct: number | null;
  gaitAsymmetryPct: number | null;
  dfaAlpha: number | null;
  dfaAlphaReason: string | null;
  /** Standard error of α's log–log slope (a floor on its uncertainty); null when α is null. */
  dfaAlphaUncertainty?: number | null;
  /** Mean walking speed over steady strides (m/s); null with walkingSpeedReason when not computable. */
  walkingSpeedMPerS: number | null;
  /** Mean stride length over steady strides (m); null with walkingSpeedReason when not computable. */
  strideLengthM: number | null;
  walkingSpeedReason: string | null;
  /** Swing-time CV per side (%), within bouts, combined across bouts. */
  swingTimeCvPct: PerSide<number | null>;
  /** Step-time asymmetry (%), definition and source in signal/README.md. */
  stepTimeAsymmetryPct: number | null;
  /** Sagittal arm swing; null with armSwingReason when no wrist sensor or not computable. */
  armSwing: ArmSwing | null;
  armSwingReason: string | null;
  /**
   * How many strides or steps each metric used, keyed by the metric's name in this object (e.g.
   * `cadenceStepsPerMin` → steps, `strideTimeCvPct` → strides, `dfaAlpha` → consecutive strides).
   */
  counts: Record<string, number>;
  armLeg: {
    leftArmRightLeg: ArmLegCoupling;
    rightArmLeftLeg: ArmLegCoupling;
  };
}

export interface Bout {
  startS: number;
  endS: number;
}

/**
 * One sensor's sagittal angular velocity on the session grid, with the orientation decisions behind
 * it (returned by analyze() when asked with `sagittalSignals: true`; never part of the stored JSON).
 */
export interface SagittalSignal {
  placement: Placement;
  sampleRateHz: number;
  /** Session time of sample 0. */
  startS: number;
  /** deg/s, sign as the analysis uses it; meaningless where `valid` is 0. */
  omegaDegS: Float64Array;
  /** 1 where the sensor has data (not outside its recording, not inside a long gap). */
  valid: Uint8Array;
  /** Unit rotation axis in the sensor frame, or null when too few samples (then the z axis). */
  axis: [number, number, number] | null;
  /** The samples the axis came from: walking bouts, the whole recording, or none (nominal z). */
  axisFrom: "walking" | "recording" | "nominal";
  /** The sign was reversed (sensor worn upside down or turned around). */
  inverted: boolean;
  /** This is the signal the leg's gait events were detected on. */
  usedForEvents: boolean;
}

export interface Analysis {
  session: {
    startUtc: string;
    durationS: number;
    sampleRateHz: number;
    placements: Placement[];
  };
  events: PerSide<{ initialContacts: number[]; finalContacts: number[]; midSwings?: number[] }>;
  strides: Stride[];
  bouts: Bout[];
  turns: Bout[];
  invalidSpans: Bout[];
  metrics: Metrics;
  quality: QualityItem[];
  algorithm: { version: string };
  /** Only with AnalyzeOptions.sagittalSignals: per placed sensor, in recording order. */
  sagittal?: SagittalSignal[];
}

/** Thrown for input the analysis refuses: the message names file, line and column where known. */
export class SignalInputError extends Error {
  override readonly name = "SignalInputError";
  constructor(
    message: string,
    readonly fileName?: string,
    readonly line?: number,
    readonly column?: string,
  ) {
    super(message);
  }
}
