import { projectOnAxis } from "../orientation/sagittal-axis";
import { wristOrientation } from "../orientation/wrist-sign";
import type { ArmLegCoupling, ArmSwing, Bout, ImuSignals, Placement, QualityItem, Side, Stride } from "../types";
import { armLegCouplingDetail } from "./arm-leg-coupling";
import { armSwingAmplitude, armSwingAsymmetryPct, NO_ARM_SWING_DEG } from "./arm-swing";

/** Walking aid recorded for the session (by the clinician); any aid but "none" takes an arm out of free swing. */
export type WalkingAid = "none" | "cane" | "crutches" | "rollator" | "other";
export const WALKING_AIDS: readonly WalkingAid[] = ["none", "cane", "crutches", "rollator", "other"];

/** Samples within this time of a turn are not used for the wrist's axis and sign (s, common practice). */
export const TURN_MARGIN_S = 0.5;

export type WristSignals = ImuSignals;

export interface SessionArmsInput {
  wrists: Partial<Record<Side, WristSignals>>;
  /** Forward-positive shank (or foot) ω and the initial contacts of each leg. */
  legs: Partial<Record<Side, { omegaDegS: Float64Array; initialContactsS: readonly number[] }>>;
  sampleRateHz: number;
  strideFrequencyHz: number;
  steadyStrides: readonly Stride[];
  turns: readonly Bout[];
  walkingAid?: WalkingAid;
}

export interface SessionArms {
  armLeg: { leftArmRightLeg: ArmLegCoupling; rightArmLeftLeg: ArmLegCoupling };
  armSwing: ArmSwing | null;
  armSwingReason: string | null;
  counts: Record<string, number>;
  quality: QualityItem[];
  /** Wrists whose sagittal rotation was sign-corrected (worn upside down or turned around). */
  signCorrected: Placement[];
}

const blank = (reason: string): ArmLegCoupling => ({ frequencyRatio: null, meanRelativePhaseDeg: null, couplingStrength: null, circularSdDeg: null, reason });

/**
 * The arm part of one session: for each wrist, its sagittal axis and sign from physics
 * (`wristOrientation`), its swing amplitude, and its coupling with the contralateral leg; then the
 * arm swing asymmetry and the quality items. Rules, in order, for a wrist's coupling:
 * - a walking aid recorded → all fields null, "walking aid used" (`no-arm-swing`, info);
 * - median range of motion < 5° → all fields null, "no arm swing" (`no-arm-swing`);
 * - sign not verified by the body's forward acceleration → ratio and R kept, mean phase null
 *   (`arm-sign-unverified`); a device found upside down by gravity is still corrected (`inverted-sensor`);
 * - both wrists verified and both facing backward → probable left/right swap (`placement-swap`),
 *   mean phases null (a device turned on its own wrist reads the same, so the labels are not changed).
 */
export function sessionArms(input: SessionArmsInput): SessionArms {
  const fs = input.sampleRateHz;
  const f = input.strideFrequencyHz;
  const quality: QualityItem[] = [];
  const counts: Record<string, number> = {};
  const contra = (side: Side): Side => (side === "left" ? "right" : "left");
  const pairs: Array<[Side, "leftArmRightLeg" | "rightArmLeftLeg"]> = [
    ["left", "leftArmRightLeg"],
    ["right", "rightArmLeftLeg"],
  ];
  const armLeg = { leftArmRightLeg: blank("no left wrist sensor"), rightArmLeftLeg: blank("no right wrist sensor") };
  const amplitude: Record<Side, number | null> = { left: null, right: null };
  const amplitudeReason: string[] = [];
  const signCorrected: Placement[] = [];
  const cycleCounts: number[] = [];
  const facing: Partial<Record<Side, boolean | null>> = {};
  const anyWrist = input.wrists.left || input.wrists.right;
  if (!anyWrist) {
    return { armLeg, armSwing: null, armSwingReason: "no wrist sensors in this session", counts, quality, signCorrected };
  }
  if (!Number.isFinite(f) || f <= 0 || input.steadyStrides.length === 0) {
    const reason = "no steady strides to time the arm swing against";
    return { armLeg: { leftArmRightLeg: blank(reason), rightArmLeftLeg: blank(reason) }, armSwing: null, armSwingReason: reason, counts, quality, signCorrected };
  }

  const n = (input.wrists.left ?? input.wrists.right)!.valid.length;
  const steadyMask = new Uint8Array(n);
  for (const s of input.steadyStrides) steadyMask.fill(1, Math.max(0, Math.ceil(s.icS * fs)), Math.min(n, Math.floor(s.nextIcS * fs) + 1));
  for (const t of input.turns) steadyMask.fill(0, Math.max(0, Math.floor((t.startS - TURN_MARGIN_S) * fs)), Math.min(n, Math.ceil((t.endS + TURN_MARGIN_S) * fs)));
  const allIcs = [...(input.legs.left?.initialContactsS ?? []), ...(input.legs.right?.initialContactsS ?? [])].sort((a, b) => a - b);

  for (const [side, key] of pairs) {
    const wrist = input.wrists[side];
    if (!wrist) continue;
    const placement = `${side}_wrist` as Placement;
    const leg = input.legs[contra(side)];
    const mask = andMask(steadyMask, wrist.valid);
    const orientation = wristOrientation({ ...wrist, mask, sampleRateHz: fs, strideFrequencyHz: f, initialContactsS: allIcs });
    if (!orientation) {
      armLeg[key] = blank(`${side} wrist: too little straight walking with wrist data to find its swing axis`);
      amplitudeReason.push(armLeg[key].reason!);
      continue;
    }
    const omega = projectOnAxis(wrist.gyroX, wrist.gyroY, wrist.gyroZ, orientation.rightAxis);

    // Quality: wear.
    const wear: string[] = [];
    if (orientation.upsideDown) wear.push("upside down (gravity points along its forearm axis the other way)");
    if (orientation.turnedAround) wear.push("turned around (its forward axis faces backward: worn on the inner wrist or on the other arm)");
    if (orientation.flippedFromNominal) signCorrected.push(placement);
    if (orientation.flippedFromNominal || wear.length > 0) {
      quality.push({
        code: "inverted-sensor",
        severity: "warning",
        placement,
        message: `${placement} appears to be worn ${wear.join(" and ") || "differently from its nominal axes"}; its sagittal rotation was ${orientation.flippedFromNominal ? "sign-corrected" : "kept (the two turns cancel)"} before analysis`,
      });
    }
    if (!orientation.verified) {
      quality.push({
        code: "arm-sign-unverified",
        severity: "warning",
        placement,
        message: `${placement}: the body's forward acceleration around heel strikes was too weak to confirm which way the wrist faces; arm swing amplitude and coupling strength are reported, the arm–leg mean phase is not`,
      });
    }
    facing[side] = orientation.verified ? orientation.turnedAround : null;

    // Amplitude over the paired leg's steady strides (each stride = one arm cycle at 1:1).
    const paired = input.steadyStrides.filter((s) => s.side === contra(side));
    const cycles = (paired.length > 0 ? paired : input.steadyStrides).map((s) => ({ startS: s.icS, endS: s.nextIcS }));
    const swing = armSwingAmplitude(omega, mask, fs, f, cycles);
    if (swing) {
      amplitude[side] = swing.amplitudeDeg;
      cycleCounts.push(swing.cycleCount);
    } else amplitudeReason.push(`${side} wrist: fewer than 10 steady strides with wrist data`);

    if (!leg) {
      armLeg[key] = blank(`no ${contra(side)} leg sensor to pair the ${side} arm with`);
      continue;
    }
    const detail = armLegCouplingDetail(omega, leg.omegaDegS, fs, f, mask);
    const { strideCount, rhythm: _rhythm, ...coupling } = detail;
    counts[`armLeg.${key}`] = strideCount;
    if (input.walkingAid && input.walkingAid !== "none") {
      armLeg[key] = blank(`walking aid used (${input.walkingAid}): arm swing is not free, so arm–leg coupling is not reported`);
      continue;
    }
    if (swing && swing.amplitudeDeg < NO_ARM_SWING_DEG) {
      armLeg[key] = blank(`no arm swing (median range ${swing.amplitudeDeg.toFixed(1)}° < ${NO_ARM_SWING_DEG}°)`);
      quality.push({
        code: "no-arm-swing",
        severity: "info",
        placement,
        message: `${placement}: median arm swing ${swing.amplitudeDeg.toFixed(1)}° per stride (< ${NO_ARM_SWING_DEG}°); arm–leg coupling is not reported for this arm`,
      });
      continue;
    }
    armLeg[key] =
      !orientation.verified && coupling.meanRelativePhaseDeg !== null
        ? { ...coupling, meanRelativePhaseDeg: null, reason: "the wrist's forward direction could not be confirmed, so the phase could be off by 180°" }
        : coupling;
  }

  if (input.walkingAid && input.walkingAid !== "none") {
    quality.push({
      code: "no-arm-swing",
      severity: "info",
      message: `walking aid recorded (${input.walkingAid}): arm–leg coupling is not reported; arm swing amplitude is shown for information only`,
    });
  }
  if (facing.left === true && facing.right === true) {
    quality.push({
      code: "placement-swap",
      severity: "warning",
      message:
        "both wrist sensors face backward, which is what each would do on the other arm: the left and right wrist devices were probably swapped (or both worn on the inner wrist). Arm values may belong to the other arm; arm–leg mean phases are not reported",
    });
    for (const [, key] of pairs) {
      if (armLeg[key].meanRelativePhaseDeg !== null) armLeg[key] = { ...armLeg[key], meanRelativePhaseDeg: null, reason: "wrist devices probably swapped between arms" };
    }
  }

  const haveAny = amplitude.left !== null || amplitude.right !== null;
  if (cycleCounts.length > 0) counts.armSwing = Math.min(...cycleCounts);
  return {
    armLeg,
    armSwing: haveAny
      ? { left: { amplitudeDeg: amplitude.left }, right: { amplitudeDeg: amplitude.right }, asymmetryPct: armSwingAsymmetryPct(amplitude.left, amplitude.right) }
      : null,
    armSwingReason: amplitudeReason.length > 0 ? amplitudeReason.join("; ") : !input.wrists.left ? "no left wrist sensor" : !input.wrists.right ? "no right wrist sensor" : null,
    counts,
    quality,
    signCorrected,
  };
}

/**
 * a AND b per sample. Sample loops stay out of sessionArms: a loop there makes the engine compile
 * the whole step, wrist orientation and coupling included, while it runs (hundreds of milliseconds of compile time on
 * a 30-minute session for code that runs once).
 */
function andMask(a: Uint8Array, b: Uint8Array): Uint8Array {
  const out = new Uint8Array(a.length);
  for (let i = 0; i < out.length; i++) out[i] = a[i]! & b[i]!;
  return out;
}
