import type { ResampledSensor } from "../timebase/resample-to-grid";
import type { QualityItem, SensorRecording } from "../types";
import { SATURATION_FLOOR_ACC_M_S2, SATURATION_FLOOR_GYRO_DEG_S, countSaturatedSamples } from "./saturation";
import { RATE_MISMATCH_FRACTION } from "./thresholds";

/**
 * What one placed recording tells about itself once on the session grid: interpolated short gaps,
 * spans without data, an effective rate away from the nominal one, and flat-topped (saturated)
 * samples per channel. Items in that order.
 */
export function recordingQuality(r: SensorRecording, s: ResampledSensor): QualityItem[] {
  const quality: QualityItem[] = [];
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
  return quality;
}
