// Which chart each trend key belongs to and how it is named. Keys arrive flattened by the server in
// one of several spellings (`stancePct.left`, `stancePctLeft`, `armLeg.leftArmRightLeg.couplingStrength`,
// `leftArmRightLegCouplingStrength`), so matching is by lower-cased parts.

export type FamilyId =
  | "speed"
  | "strideLength"
  | "cadence"
  | "variability"
  | "swingVariability"
  | "phases"
  | "stepAsymmetry"
  | "pci"
  | "armSwing"
  | "armSwingAsymmetry"
  | "armLegRatio"
  | "armLegCoupling";

export interface FamilyInfo {
  id: FamilyId;
  title: string;
  description: string;
}

export const FAMILIES: FamilyInfo[] = [
  { id: "speed", title: "Walking speed", description: "Mean speed over the steady strides of each session, in metres per second. Needs the patient's height; a walking aid changes it." },
  { id: "strideLength", title: "Stride length", description: "Mean length of a stride (two steps) over the steady strides, in metres." },
  { id: "cadence", title: "Cadence", description: "Steps per minute over the steady strides of each session." },
  { id: "variability", title: "Stride-time variability", description: "Coefficient of variation of stride time (both legs pooled)." },
  { id: "swingVariability", title: "Swing-time variability", description: "Coefficient of variation of swing time, per side, within walking bouts." },
  { id: "phases", title: "Stance and double support", description: "Stance per side and double support, as % of the stride." },
  { id: "stepAsymmetry", title: "Step-time asymmetry", description: "Difference between left and right step times relative to their mean; 0 % is symmetric." },
  { id: "pci", title: "Phase Coordination Index", description: "Left–right stepping coordination (Plotnik, Giladi & Hausdorff 2007); lower is more consistent." },
  { id: "armSwing", title: "Arm swing amplitude", description: "Sagittal range of motion of each arm per arm cycle, in degrees." },
  { id: "armSwingAsymmetry", title: "Arm swing asymmetry", description: "Left–right difference in arm swing amplitude; 0 % is symmetric. A walking aid changes arm swing." },
  { id: "armLegRatio", title: "Arm–leg frequency ratio", description: "Arm swing cycles per stride: 1 (1:1) or 2 (2:1) when locked, else the measured value." },
  { id: "armLegCoupling", title: "Arm–leg coupling strength", description: "Mean resultant length R of the n:m relative phase, 0 (none) to 1 (fully locked)." },
];

const norm = (key: string) => key.toLowerCase().replace(/[^a-z0-9]/g, "");

export function familyOf(key: string): FamilyId | null {
  const k = norm(key);
  if (k.includes("walkingspeed")) return "speed";
  if (k.includes("stridelength")) return "strideLength";
  if (k.includes("cadence")) return "cadence";
  if (k.includes("stridetimecv")) return "variability";
  if (k.includes("swingtimecv")) return "swingVariability";
  if (k.includes("steptimeasymmetry")) return "stepAsymmetry";
  if (k.includes("armswingamplitude")) return "armSwing";
  if (k.includes("armswingasymmetry")) return "armSwingAsymmetry";
  if (k.includes("doublesupport") || k.includes("stancepct")) return "phases";
  if (k.includes("phasecoordination")) return "pci";
  if (k.includes("frequencyratio")) return "armLegRatio";
  if (k.includes("couplingstrength")) return "armLegCoupling";
  return null;
}

export function metricLabel(key: string, given?: string): string {
  if (given) return given;
  const k = norm(key);
  const pair = k.includes("leftarmrightleg") ? "left arm–right leg" : k.includes("rightarmleftleg") ? "right arm–left leg" : null;
  const side = pair ? null : k.includes("left") ? "left" : k.includes("right") ? "right" : null;
  let base = key;
  if (k.includes("walkingspeed")) base = "Walking speed";
  else if (k.includes("stridelength")) base = "Stride length";
  else if (k.includes("swingtimecv")) base = "Swing-time CV";
  else if (k.includes("steptimeasymmetry")) base = "Step-time asymmetry";
  else if (k.includes("armswingamplitude")) base = "Arm swing";
  else if (k.includes("armswingasymmetry")) base = "Arm swing asymmetry";
  else if (k.includes("cadence")) base = "Cadence";
  else if (k.includes("stridetimecv")) base = "Stride-time CV";
  else if (k.includes("doublesupport")) base = "Double support";
  else if (k.includes("stancepct")) base = "Stance";
  else if (k.includes("phasecoordination")) base = "PCI";
  else if (k.includes("frequencyratio")) base = "Frequency ratio";
  else if (k.includes("couplingstrength")) base = "Coupling R";
  return pair ? `${base}, ${pair}` : side ? `${base}, ${side}` : base;
}

const PALETTE = ["var(--color-moss)", "var(--color-clay-deep)", "var(--color-sky-deep)", "var(--color-ochre)"];
export const seriesColor = (i: number) => PALETTE[i % PALETTE.length]!;
