import type { Analysis } from "./types";

const f = (v: number | null, digits = 1, unit = "") => (v === null ? "—" : `${v.toFixed(digits)}${unit}`);

/** Plain-text summary of an analysis for the terminal. */
export function formatAnalysisTable(a: Analysis): string {
  const m = a.metrics;
  const rows: Array<[string, string, string]> = [
    ["Steady-state strides", String(m.steadyStrideCount), ""],
    ["Cadence", f(m.cadenceStepsPerMin, 1), "steps/min"],
    ["Stride time (mean)", f(m.strideTimeMeanS, 3), "s"],
    ["Stride time CV", f(m.strideTimeCvPct, 2), "%"],
    [
      "Walking speed",
      m.walkingSpeedMPerS === null ? `— (${m.walkingSpeedReason ?? "n/a"})` : `${m.walkingSpeedMPerS.toFixed(2)} m/s over ${m.counts.walkingSpeedMPerS ?? 0} strides`,
      "",
    ],
    ["Stride length (mean)", m.strideLengthM === null ? "—" : `${m.strideLengthM.toFixed(2)} m over ${m.counts.strideLengthM ?? 0} strides`, ""],
    ["Step time L / R", `${f(m.stepTimeMeanS.left, 3)} / ${f(m.stepTimeMeanS.right, 3)}`, "s"],
    ["Stance L / R", `${f(m.stancePct.left)} / ${f(m.stancePct.right)}`, "% stride"],
    ["Swing L / R", `${f(m.swingPct.left)} / ${f(m.swingPct.right)}`, "% stride"],
    ["Double support", f(m.doubleSupportPct), "% stride"],
    ["Phase Coordination Index", f(m.phaseCoordinationIndexPct, 2), "%"],
    ["Gait asymmetry", f(m.gaitAsymmetryPct, 2), "%"],
    ["DFA alpha", m.dfaAlpha === null ? `— (${m.dfaAlphaReason ?? "n/a"})` : m.dfaAlpha.toFixed(3), ""],
  ];
  for (const [label, c] of [
    ["Left arm – right leg", m.armLeg.leftArmRightLeg],
    ["Right arm – left leg", m.armLeg.rightArmLeftLeg],
  ] as const) {
    rows.push([
      label,
      c.frequencyRatio === null
        ? "—"
        : `ratio ${f(c.frequencyRatio, 2)}, phase ${f(c.meanRelativePhaseDeg, 0, "°")}, R ${f(c.couplingStrength, 2)}, SD ${f(c.circularSdDeg, 0, "°")}`,
      "",
    ]);
  }
  const w = Math.max(...rows.map((r) => r[0].length));
  const lines = [
    `Session ${a.session.startUtc}  ${a.session.durationS.toFixed(1)} s  ${a.session.sampleRateHz} Hz  [${a.session.placements.join(", ")}]`,
    `Bouts ${a.bouts.length}, turns ${a.turns.length}, strides ${a.strides.length}; algorithm ${a.algorithm.version}`,
    "",
    ...rows.map(([l, v, u]) => `${l.padEnd(w)}  ${v}${u ? ` ${u}` : ""}`),
    "",
    a.quality.length === 0 ? "Quality: no issues" : "Quality:",
    ...a.quality.map((q) => `  [${q.severity}] ${q.code}${q.placement ? ` (${q.placement})` : ""}: ${q.message}`),
    "",
    "Pendula supports clinical decisions; it does not diagnose. Interpret with licensed clinical judgement and local protocols.",
  ];
  return lines.join("\n") + "\n";
}
