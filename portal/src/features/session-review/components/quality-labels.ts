import type { QualityCode } from "@pendula/signal";

/**
 * Plain headings for the analysis' quality codes. The message under each heading comes from the
 * analysis and gives the detail (file, side, counts); the code stays visible, small, for support.
 */
export const QUALITY_LABEL: Record<QualityCode, string> = {
  gap: "Data gap",
  "invalid-span": "Stretch of unusable data",
  saturation: "Sensor reached its measuring limit",
  "inverted-sensor": "Sensor worn upside down (corrected)",
  "rate-mismatch": "Sample rate differs from the stated one",
  "few-strides": "Few steady strides",
  "missing-placement": "Sensor without a placement",
  "no-walking": "No walking found",
  misalignment: "Sensor turned on the limb",
  "dfa-unavailable": "Long-range stride correlation not computed",
  "event-order": "Gait events out of order",
  "strides-excluded": "Strides left out of the steady-state metrics",
  "clock-offset": "Sensor clocks differed (corrected)",
  "clock-unverified": "Sensor clock alignment could not be checked",
  "speed-unavailable": "Walking speed and stride length not available",
  "arm-sign-unverified": "Arm swing direction could not be confirmed",
  "placement-swap": "Left and right sensors may be swapped",
  "no-arm-swing": "No measurable arm swing",
};

export const qualityLabel = (code: string): string => QUALITY_LABEL[code as QualityCode] ?? code;
