import type { Analysis, Placement } from "@pendula/signal";

/**
 * Sagittal angular velocity per placement for the portal's session chart: the signals analyze()
 * itself worked on (`Analysis.sagittal`, asked for with `sagittalSignals: true`) — for a leg the very
 * signal its events were found on, after clock alignment and with its axis and sign — so nothing is
 * resampled, projected or sign-checked a second time here. Stored at processing time rather than
 * recomputed per request because (1) the chart then always matches the events of the stored
 * analysis, even after the algorithm changes, until the session is reprocessed; (2) the chart route
 * only slices and decimates a Float32 array instead of re-reading and re-parsing megabytes of text
 * from object storage on every zoom.
 *
 * Samples outside a recording or inside a long gap are NaN, so the chart shows a break there.
 */
export interface SessionTrace {
  placement: Placement;
  sampleRateHz: number;
  /** Session time of sample 0. */
  startS: number;
  samples: Float32Array;
}

export function sagittalTraces(analysis: Pick<Analysis, "sagittal">): SessionTrace[] {
  if (!analysis.sagittal) throw new Error("sagittalTraces needs analyze(…, { sagittalSignals: true })");
  return analysis.sagittal.map((s) => {
    const samples = new Float32Array(s.omegaDegS.length);
    for (let i = 0; i < samples.length; i++) samples[i] = s.valid[i] ? s.omegaDegS[i]! : Number.NaN;
    return { placement: s.placement, sampleRateHz: s.sampleRateHz, startS: s.startS, samples };
  });
}
