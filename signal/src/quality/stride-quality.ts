import type { QualityItem, Stride } from "../types";
import { describeExcludedStrides } from "../gait/excluded-strides";
import { MIN_STEADY_STRIDES_FOR_VARIABILITY } from "./thresholds";

/** Notes on the strides that were left out or lack a usable final contact, in that order. */
export function strideQuality(strides: readonly Stride[]): QualityItem[] {
  const quality: QualityItem[] = [];
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
  return quality;
}

/**
 * The session-level warning about how much walking there was: none at all (an error: no gait
 * metrics), or fewer steady strides than variability needs (CV, PCI; Galna et al. 2013; Kroneberg
 * et al. 2019). Null when there is enough.
 */
export function walkingAmountQuality(boutCount: number, strideCount: number, steadyStrideCount: number): QualityItem | null {
  if (boutCount === 0 || strideCount === 0) {
    return { code: "no-walking", severity: "error", message: "no walking was found in this session; no gait metrics were computed" };
  }
  if (steadyStrideCount < MIN_STEADY_STRIDES_FOR_VARIABILITY) {
    return {
      code: "few-strides",
      severity: "warning",
      message: `only ${steadyStrideCount} steady-state strides; variability (CV, PCI) needs at least ${MIN_STEADY_STRIDES_FOR_VARIABILITY} steps (Galna et al. 2013; Kroneberg et al. 2019) — interpret with caution`,
    };
  }
  return null;
}
