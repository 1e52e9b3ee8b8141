import type { Bout, PerSide, Placement, SensorRecording, Side } from "../../types";

/**
 * Public shapes of the kinematic session generator (`synthesizeKinematicSession`). Everything here is
 * an invented scenario: no recording of a person is used. Conventions (see signal/docs/kinematic-generator.md):
 * body frame +x forward, +y up, +z to the subject's right; sagittal segment angles are measured from
 * the vertical, positive when the segment's lower end is forward of its upper end, so a positive
 * rate about +z is the lower end (ankle, hand) moving forward.
 */

export type KinematicPlacement = Extract<Placement, "left_shank" | "right_shank" | "left_wrist" | "right_wrist" | "lower_back">;

/** How a wrist device sits on the forearm (the body-frame vector v is read as M·v in the sensor). */
export type WristWear =
  /** Nominal frame: gyro_z is the forward swing of the hand, acc_y reads +9.81 m/s² hanging still. */
  | "standard"
  /** Watch on the other face of the wrist: 180° about the vertical, so gyro_z, gyro_x, acc_x, acc_z change sign. */
  | "mirrored"
  /** Band turned end for end: 180° about the forward axis, so gyro_y, gyro_z, acc_y, acc_z change sign. */
  | "upside-down";

/** Per-leg kinematic changes from the normative pattern (1 / 0 = normative). */
export interface KinematicLegOptions {
  /** Scales thigh, knee and ankle excursions about their means (small steps < 1). Default 1. */
  romScale?: number;
  /** Scales knee flexion above its stance level during swing (stiff-knee gait < 1). Default 1. */
  swingKneeScale?: number;
  /** Knee recurvatum in mid-stance, degrees (a brief backward snap of the shank). Default 0. */
  hyperextensionDeg?: number;
  /** Extra hip abduction of the swinging leg, degrees (circumduction: larger out-of-plane rotation). Default 0. */
  circumductionDeg?: number;
  /** Stance as a fraction of the stride (0.5–0.85). Default from the session's stanceFraction. */
  stanceFraction?: number;
}

/** A walking bout; consecutive bouts are separated by `standingBetweenS` of quiet standing. */
export interface KinematicBoutOptions {
  durationS: number;
  /** Mean stride time, s (0.6–4). Default: the session's strideTimeS. */
  strideTimeS?: number;
  /** Stride-time coefficient of variation, % (draws are N(T, (cv·T)²), clamped to ±3 SD). */
  strideTimeCvPct?: number;
  /** Scales every joint's excursion in this bout (slow walks take small steps). Default 1. */
  romScale?: number;
}

/** A standing pause inside a walking bout, starting at the first IC at or after `atS` of walking time. */
export interface HesitationOptions {
  /** Seconds of walking (pauses excluded) from the start of the bout it falls in. */
  atS: number;
  /** Pause length, s (0.2–5). */
  durationS: number;
  /** Bout the pause belongs to (0-based). Default 0. */
  boutIndex?: number;
}

/**
 * A span of short, quick, irregular strides (festination-like): stride time and joint excursions
 * are scaled by factors reached after a 30 % ramp in and held to the end of the span.
 */
export interface ShortStrideEpisodeOptions {
  /** Seconds of walking from the start of the bout. */
  startS: number;
  durationS: number;
  boutIndex?: number;
  /** Multiplies the stride time (0.4–1). Default 0.6. */
  strideTimeScale?: number;
  /** Multiplies joint excursions (0.2–1). Default 0.5. */
  romScale?: number;
  /** Stride-time CV inside the episode, %. Default 8. */
  strideTimeCvPct?: number;
}

export interface KinematicArmOptions {
  /** Arm cycles per contralateral-leg stride. "none" = arms hang still. Default "1:1". */
  coupling?: "1:1" | "2:1" | "none";
  /**
   * Requested relative phase ψ (degrees): the phase of the arm angle's harmonic at n cycles per stride
   * minus n × the phase of the contralateral shank angle's first harmonic, both over one contralateral
   * stride (see the doc). Default 20. The truth reports the value the model realises.
   */
  relativePhaseDeg?: number;
  /** Sagittal swing range per arm cycle (peak to peak, degrees). Default 30. A side with 0 hangs still. */
  rangeDeg?: number | Partial<PerSide<number>>;
  /** Second harmonic as a percentage of the first (non-sinusoidal swing). Default 40 for 1:1, 0 for 2:1. */
  secondHarmonicPct?: number;
  /** Fraction of the range in front of the hanging position (0–1). Default 0.4. */
  forwardFraction?: number;
  /** Arms held still (e.g. on a walking aid): no swing, a small tremor instead. */
  heldStill?: Side[];
  /** Tremor of a still arm: amplitude (degrees) and frequency (Hz). Default 0.05° at 5 Hz (≈ 0.5 m/s² at the wrist). */
  tremor?: { amplitudeDeg?: number; frequencyHz?: number };
  wear?: Partial<PerSide<WristWear>>;
}

export interface KinematicNoiseOptions {
  /** White gyro noise SD, deg/s. Default 1.5. */
  gyroDegS?: number;
  /** White accelerometer noise SD, m/s². Default 0.05. */
  accMs2?: number;
  /** Constant gyro bias per device, drawn N(0, SD²), deg/s. Default 0.5. */
  gyroBiasDegS?: number;
  /** Heel-strike impact on the striking shank: peak specific-force change, m/s². Default 25 (0 = off). */
  impactMs2?: number;
  /** First value of the heel-strike jolt in the striking shank's gyro_z, deg/s (negative: the lower end is kicked back). Default 30. */
  impactGyroDegS?: number;
  /** Strap / soft-tissue ripple bursts (10–20 Hz) on the shanks: peak rate, deg/s. Default 12 (0 = off). */
  rippleDegS?: number;
  /** Postural sway while standing: SD of the slow segment rate, deg/s. Default 2 (0 = off). */
  standingSwayDegS?: number;
}

export interface KinematicOptions {
  /** Same options and seed give identical recordings. Default 1. */
  seed?: number;
  /** 60–200 Hz. Default 100. */
  sampleRateHz?: number;
  /** ISO UTC of the session start. Default "2026-11-23T09:15:02.120Z". */
  startUtc?: string;
  placements?: KinematicPlacement[];
  /** Standing before the first bout and after the last, s. Default 4 / 4. */
  leadInS?: number;
  leadOutS?: number;
  /** Walking bouts in order. Default one bout of 90 s. */
  bouts?: KinematicBoutOptions[];
  /** Quiet standing between bouts, s. Default 6. */
  standingBetweenS?: number;
  /** Session-wide defaults for the bouts. */
  strideTimeS?: number;
  strideTimeCvPct?: number;
  stanceFraction?: number;
  /** Right IC as a fraction of the left stride after the left IC (0.5 = symmetric steps). Default 0.5. */
  stepFraction?: number;
  legs?: Partial<PerSide<KinematicLegOptions>>;
  hesitations?: HesitationOptions[];
  shortStrideEpisodes?: ShortStrideEpisodeOptions[];
  arms?: KinematicArmOptions;
  /** Standing height, cm (segment lengths from anthropometric proportions). Default 172. */
  heightCm?: number;
  /**
   * Per-device clock error, s: the samples of that file hold the body's motion at (file time + offset)
   * while its start_utc is unchanged, so its events appear `offset` early on the session base.
   */
  clockOffsetS?: Partial<Record<KinematicPlacement, number>>;
  /** Fixed mounting rotation of a device: angle (degrees, 0–45) about a random axis. */
  misalignmentDeg?: Partial<Record<KinematicPlacement, number>>;
  noise?: KinematicNoiseOptions;
}

/** One stride of the model (times in seconds on the session base). */
export interface KinematicStrideTruth {
  side: Side;
  icS: number;
  nextIcS: number;
  fcS: number;
  strideTimeS: number;
  stanceTimeS: number;
  swingTimeS: number;
  stancePct: number;
  /** A hesitation (standing pause) lies inside this stride. */
  containsPause: boolean;
  /** First or last stride of its bout on this side (gait initiation or termination). */
  boutEdge: boolean;
  boutIndex: number;
  /** Forward travel of the pelvis between the two ICs, m. */
  strideLengthM: number;
  walkingSpeedMPerS: number;
}

export interface KinematicLegTruth {
  /** The model's contacts: IC = heel reaches the ground, FC = toe leaves it (phase knots of the schedule). */
  ic: number[];
  fc: number[];
  strides: KinematicStrideTruth[];
}

export interface KinematicArmTruth {
  side: Side;
  /** Arm cycles per contralateral stride, null when the arm does not swing. */
  ratio: 1 | 2 | null;
  /** Circular mean of ψ (degrees, (−180, 180]) on the model's segment angles; null without swing. */
  relativePhaseDeg: number | null;
  /** Same on angular rates: ψ + 90°·(1 − n), equal for 1:1, 90° less for 2:1. */
  relativePhaseRateDeg: number | null;
  requestedRelativePhaseDeg: number | null;
  /** Mean sagittal range of the arm angle per arm cycle, degrees (0 when held still). */
  swingRangeDeg: number;
  /** Range of each arm cycle in order (one per steady contralateral stride for 1:1, two for 2:1), degrees. */
  swingRangesDeg: number[];
  /** Number of steady contralateral strides behind the phase and range. */
  cycles: number;
  wear: WristWear;
  /** Sign with which the hand's forward-swing rate appears on the device's gyro_z (before misalignment). */
  sagittalSign: 1 | -1;
  heldStill: boolean;
}

export interface KinematicSummaryTruth {
  /** Strides behind the summary: not at a bout edge and holding no pause. */
  strideCount: number;
  cadenceStepsPerMin: number;
  strideTimeMeanS: number;
  /** Realised CV of the same strides, % (ddof 1). */
  strideTimeCvPct: number;
  stancePct: PerSide<number>;
  swingPct: PerSide<number>;
  doubleSupportPct: number;
  walkingSpeedMPerS: number;
  strideLengthM: number;
}

export interface KinematicTruth {
  left: KinematicLegTruth;
  right: KinematicLegTruth;
  summary: KinematicSummaryTruth;
  arms: PerSide<KinematicArmTruth | null>;
  /** Spans of walking (first FC to last IC of each bout, pauses included). */
  bouts: Bout[];
  hesitations: Bout[];
  standing: Bout[];
  clockOffsetS: Partial<Record<KinematicPlacement, number>>;
  sampleRateHz: number;
  durationS: number;
}

/** Noiseless model quantities at any session time (for tests of the model's physics). */
export interface KinematicModelProbe {
  /** Shank sagittal angle, degrees from vertical, lower end forward positive. */
  shankAngleDeg(side: Side, tS: number): number;
  /** Its time derivative, deg/s. */
  shankRateDegS(side: Side, tS: number): number;
  thighAngleDeg(side: Side, tS: number): number;
  kneeFlexionDeg(side: Side, tS: number): number;
  ankleDorsiflexionDeg(side: Side, tS: number): number;
  footPitchDeg(side: Side, tS: number): number;
  armAngleDeg(side: Side, tS: number): number;
  /** Pelvis (hip-joint centre) position, m: forward and up. */
  pelvisPositionM(tS: number): [number, number];
}

export interface KinematicSession {
  recordings: SensorRecording[];
  truth: KinematicTruth;
  model: KinematicModelProbe;
}

/** Signature of the generator (implemented in synthesize-kinematic-session.ts). */
export type SynthesizeKinematicSession = (options?: KinematicOptions) => KinematicSession;
