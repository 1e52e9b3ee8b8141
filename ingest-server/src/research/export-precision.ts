/**
 * How precisely each metric leaves the server in a research export (JSON, CSV and FHIR alike); the
 * step per metric is part of its catalogue entry (contracts/metric-catalog.ts).
 * Full-precision values are a fingerprint: a researcher who also sees a clinical screen could match
 * "cadence 97.3846" to one patient. Each value is rounded to a step no finer than a clinician would
 * act on, with the reason and, where there is one, the source beside it. "common practice" marks a
 * step we chose without a published value behind it.
 *
 * Rounding is half away from zero (0.025 → 0.05, −12.5 → −13), as in IEEE 754-2008's
 * roundTiesToAway; the fixture checks it against Python's decimal ROUND_HALF_UP.
 */
import { METRICS, decimalsOfStep, type ExportPrecision } from "../contracts/metric-catalog";

export type { ExportPrecision } from "../contracts/metric-catalog";

/** Each metric's export step, with its reason and source, from the metric catalogue. */
export const EXPORT_PRECISION: Readonly<Record<string, ExportPrecision>> = Object.fromEntries(METRICS.map((m) => [m.key, m.exportPrecision]));

/** The strides/steps/arm cycles behind a value are published to the nearest 5 (common practice): an exact count is as matchable as an exact value. */
export const COUNT_STEP = 5;

/** `value` as a whole multiple of `step`, ties away from zero, printed without binary noise (0.15000000000000002 → 0.15). */
export function roundToStep(value: number, step: number): number {
  if (!Number.isFinite(value)) throw new RangeError(`cannot round ${value}`);
  if (!(step > 0)) throw new RangeError(`step must be positive, got ${step}`);
  // The ratio is first cut to 9 significant digits, so 0.35 / 0.05 = 6.999999999999999 counts as the tie it is.
  const ratio = Number((Math.abs(value) / step).toPrecision(9));
  const units = Math.sign(value) * Math.floor(ratio + 0.5);
  const out = Number((units * step).toFixed(decimalsOfStep(step)));
  return Object.is(out, -0) ? 0 : out;
}

/** The exported value of metric `key`; throws for a metric without a precision entry, so a new metric cannot leave unrounded. */
export function exportValue(key: string, value: number | null): number | null {
  if (value === null || !Number.isFinite(value)) return null;
  const precision = EXPORT_PRECISION[key];
  if (!precision) throw new Error(`no export precision for metric ${key}`);
  return roundToStep(value, precision.step);
}

export function exportCount(n: number | null | undefined): number | null {
  if (n === null || n === undefined || !Number.isFinite(n)) return null;
  return roundToStep(n, COUNT_STEP);
}
