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
  | "event-order";

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
  excludedReason?: "bout-edge" | "turn" | "invalid-span" | "out-of-range" | "event-order";
}

export interface ArmLegCoupling {
  /** 1 or 2 when within 15 % of it, else the measured arm-cycles-per-stride value; null when not computable. */
  frequencyRatio: number | null;
  meanRelativePhaseDeg: number | null;
  /** Mean resultant length R of the n:m relative phase, 0..1. */
  couplingStrength: number | null;
  circularSdDeg: number | null;
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
  armLeg: {
    leftArmRightLeg: ArmLegCoupling;
    rightArmLeftLeg: ArmLegCoupling;
  };
}

export interface Bout {
  startS: number;
  endS: number;
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
