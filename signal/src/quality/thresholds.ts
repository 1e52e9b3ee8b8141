/**
 * Fewer steady-state strides than this (both legs pooled, ≈ steps) trigger `few-strides`: stride-time
 * variability needs ≥ 30 continuous steps (Galna et al. 2013) and was consistent from about 20
 * strides once turns were excised (Kroneberg et al. 2019).
 */
export const MIN_STEADY_STRIDES_FOR_VARIABILITY = 30;
/** Effective vs nominal sampling rate difference above this fraction → `rate-mismatch`. */
export const RATE_MISMATCH_FRACTION = 0.02;
/** Sagittal axis further than this from nominal +z → `misalignment` (info; the analysis corrects it). */
export const MISALIGNMENT_INFO_DEG = 20;
