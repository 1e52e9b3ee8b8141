// The invented demo scenario: Fernhollow Community Gait Service, a fictional outpatient
// rehabilitation team. Every person, device and serial here is made up. This file is data only;
// ingest-server/src/dev/seed-demo.ts turns it into rows, sensor files and processed sessions.

export const DEMO_PASSWORD = "demo-walk-2026";
/**
 * The demo staff accounts' authenticator secret (base32, RFC 4648), published like the password so
 * anyone can try the demo: add it to an authenticator app, or print the current code with
 * `npm run demo:code`. Seeded in demo mode only; a real account's secret is made at enrolment.
 */
export const DEMO_TOTP_SECRET = "PENDULADEMOSTAFFWALKTESTKEYQRSTU";
export const DEMO_CLINIC = "Fernhollow Community Gait Service";

export type DemoCondition = "incomplete_sci" | "stroke" | "parkinsons" | "other";

export interface DemoStaff {
  key: string;
  email: string;
  displayName: string;
  role: "admin" | "researcher" | "clinician";
}

export interface DemoTrajectory {
  /** Cadence at week 0 and at the plateau, steps/min. */
  cadenceStart: number;
  cadenceEnd: number;
  /** Stride-time CV at week 0 and plateau, %. */
  strideCvStartPct: number;
  strideCvEndPct: number;
  /** Left/right swing-time imbalance at week 0 and plateau (0 = symmetric, 0.2 = 20 % longer on the affected side). */
  asymmetryStart: number;
  asymmetryEnd: number;
  affectedSide: "left" | "right";
  /** Weeks to reach ~63 % of the change (exponential recovery). */
  tauWeeks: number;
  /** Arm swing switches from 2:1 (step-frequency) to 1:1 once cadence exceeds this, steps/min; null = always 1:1. */
  armOneToOneAboveCadence: number | null;
  /** Arm–leg coupling: 0 = arms swing independently, 1 = tightly locked. */
  couplingStart: number;
  couplingEnd: number;
  /** From this week on the walking gets worse again (e.g. a Parkinson's off-period); null = no setback. */
  setbackFromWeek: number | null;
}

export interface DemoPatient {
  key: string;
  displayName: string;
  /** Sign-in for the patient app; most demo patients have none. */
  email?: string;
  birthYear: number;
  sex: "female" | "male" | "other";
  condition: DemoCondition;
  conditionDetail: string;
  researchConsent: boolean;
  clinicians: string[];
  weeks: number;
  /** Week indices with no upload (adherence gaps). */
  missedWeeks: number[];
  trajectory: DemoTrajectory;
}

export const DEMO_STAFF: DemoStaff[] = [
  { key: "admin", email: "admin@demo.pendula.test", displayName: "Tobin Ashgrove (service admin)", role: "admin" },
  { key: "researcher", email: "researcher@demo.pendula.test", displayName: "Dr Quilla Penrose (research)", role: "researcher" },
  { key: "clinician", email: "clinician@demo.pendula.test", displayName: "Marit Okonkwo-Reyes, PT", role: "clinician" },
  { key: "clinician2", email: "clinician2@demo.pendula.test", displayName: "Anselm Fairweather, PT", role: "clinician" },
];

const stroke = (o: Partial<DemoTrajectory> = {}): DemoTrajectory => ({
  cadenceStart: 72,
  cadenceEnd: 98,
  strideCvStartPct: 6.5,
  strideCvEndPct: 3.4,
  asymmetryStart: 0.28,
  asymmetryEnd: 0.12,
  affectedSide: "left",
  tauWeeks: 6,
  armOneToOneAboveCadence: 88,
  couplingStart: 0.35,
  couplingEnd: 0.75,
  setbackFromWeek: null,
  ...o,
});
const sci = (o: Partial<DemoTrajectory> = {}): DemoTrajectory => ({
  cadenceStart: 62,
  cadenceEnd: 92,
  strideCvStartPct: 8,
  strideCvEndPct: 4,
  asymmetryStart: 0.18,
  asymmetryEnd: 0.08,
  affectedSide: "right",
  tauWeeks: 8,
  armOneToOneAboveCadence: 84,
  couplingStart: 0.3,
  couplingEnd: 0.7,
  setbackFromWeek: null,
  ...o,
});
const pd = (o: Partial<DemoTrajectory> = {}): DemoTrajectory => ({
  cadenceStart: 96,
  cadenceEnd: 108,
  strideCvStartPct: 4.2,
  strideCvEndPct: 2.6,
  asymmetryStart: 0.1,
  asymmetryEnd: 0.05,
  affectedSide: "right",
  tauWeeks: 5,
  armOneToOneAboveCadence: null,
  couplingStart: 0.45,
  couplingEnd: 0.7,
  setbackFromWeek: null,
  ...o,
});

/**
 * Research cohorts need at least five consenting subjects per condition × age band before a cell
 * is released, so the scenario clusters ages on purpose (stroke 60–64, Parkinson's 65–69,
 * incomplete SCI 45–49) and adds a few people whose cells stay suppressed.
 */
export const DEMO_PATIENTS: DemoPatient[] = [
  // Marit's caseload (clinician@): ten people, the demo patient first.
  { key: "p01", displayName: "Wren Halloway", email: "patient@demo.pendula.test", birthYear: 1963, sex: "female", condition: "stroke", conditionDetail: "Left hemiparesis after right MCA ischaemic stroke", researchConsent: true, clinicians: ["clinician"], weeks: 16, missedWeeks: [5], trajectory: stroke() },
  { key: "p02", displayName: "Osric Delacourt", birthYear: 1964, sex: "male", condition: "stroke", conditionDetail: "Right hemiparesis", researchConsent: true, clinicians: ["clinician"], weeks: 14, missedWeeks: [], trajectory: stroke({ affectedSide: "right", cadenceStart: 68, cadenceEnd: 92 }) },
  { key: "p03", displayName: "Sabeen Marwick", birthYear: 1964, sex: "female", condition: "stroke", conditionDetail: "Left hemiparesis", researchConsent: true, clinicians: ["clinician"], weeks: 18, missedWeeks: [7, 8], trajectory: stroke({ tauWeeks: 9 }) },
  { key: "p04", displayName: "Lorcan Tiverton", birthYear: 1958, sex: "male", condition: "parkinsons", conditionDetail: "Hoehn & Yahr 2.5", researchConsent: true, clinicians: ["clinician"], weeks: 15, missedWeeks: [], trajectory: pd({ setbackFromWeek: 11 }) },
  { key: "p05", displayName: "Imelda Voss-Harker", birthYear: 1959, sex: "female", condition: "parkinsons", conditionDetail: "Hoehn & Yahr 2", researchConsent: true, clinicians: ["clinician"], weeks: 13, missedWeeks: [3], trajectory: pd() },
  { key: "p06", displayName: "Jory Penhallow", birthYear: 1979, sex: "male", condition: "incomplete_sci", conditionDetail: "AIS D, T10", researchConsent: true, clinicians: ["clinician"], weeks: 20, missedWeeks: [], trajectory: sci() },
  { key: "p07", displayName: "Tamsin Arkwright", birthYear: 1978, sex: "female", condition: "incomplete_sci", conditionDetail: "AIS D, C6", researchConsent: true, clinicians: ["clinician"], weeks: 17, missedWeeks: [10], trajectory: sci({ affectedSide: "left", cadenceStart: 58 }) },
  { key: "p08", displayName: "Eamon Quarrie", birthYear: 1977, sex: "male", condition: "incomplete_sci", conditionDetail: "AIS C→D, L1", researchConsent: false, clinicians: ["clinician"], weeks: 12, missedWeeks: [], trajectory: sci({ cadenceStart: 55, cadenceEnd: 80, armOneToOneAboveCadence: 78 }) },
  { key: "p09", displayName: "Perpetua Lindqvist", birthYear: 1946, sex: "female", condition: "other", conditionDetail: "Deconditioning after hospital stay", researchConsent: true, clinicians: ["clinician"], weeks: 12, missedWeeks: [], trajectory: pd({ cadenceStart: 88, cadenceEnd: 104, strideCvStartPct: 5 }) },
  { key: "p10", displayName: "Caspian Rudd", birthYear: 1962, sex: "male", condition: "stroke", conditionDetail: "Cerebellar stroke, ataxic gait", researchConsent: true, clinicians: ["clinician", "clinician2"], weeks: 14, missedWeeks: [], trajectory: stroke({ strideCvStartPct: 9, strideCvEndPct: 5.5, asymmetryStart: 0.08, asymmetryEnd: 0.05 }) },
  // Anselm's caseload (clinician2@): patient2@ belongs here only.
  { key: "p11", displayName: "Hollis Brackenridge", email: "patient2@demo.pendula.test", birthYear: 1957, sex: "male", condition: "parkinsons", conditionDetail: "Hoehn & Yahr 3, freezing episodes", researchConsent: true, clinicians: ["clinician2"], weeks: 16, missedWeeks: [2, 9], trajectory: pd({ cadenceStart: 92, cadenceEnd: 102, strideCvStartPct: 5.2, couplingStart: 0.3 }) },
  { key: "p12", displayName: "Ysolde Carraway", birthYear: 1960, sex: "female", condition: "parkinsons", conditionDetail: "Hoehn & Yahr 2", researchConsent: true, clinicians: ["clinician2"], weeks: 14, missedWeeks: [], trajectory: pd() },
  { key: "p13", displayName: "Barnaby Fenwick-Oduya", birthYear: 1961, sex: "male", condition: "parkinsons", conditionDetail: "Hoehn & Yahr 2.5", researchConsent: true, clinicians: ["clinician2"], weeks: 13, missedWeeks: [6], trajectory: pd({ setbackFromWeek: 9 }) },
  { key: "p14", displayName: "Odile Strand", birthYear: 1965, sex: "female", condition: "stroke", conditionDetail: "Left hemiparesis", researchConsent: true, clinicians: ["clinician2"], weeks: 15, missedWeeks: [], trajectory: stroke({ cadenceStart: 76 }) },
  { key: "p15", displayName: "Ferris Anwell", birthYear: 1980, sex: "male", condition: "incomplete_sci", conditionDetail: "AIS D, T6", researchConsent: true, clinicians: ["clinician2"], weeks: 16, missedWeeks: [], trajectory: sci({ tauWeeks: 6 }) },
  { key: "p16", displayName: "Marisol Teague", birthYear: 1981, sex: "female", condition: "incomplete_sci", conditionDetail: "AIS D, T12", researchConsent: true, clinicians: ["clinician2"], weeks: 14, missedWeeks: [4], trajectory: sci({ affectedSide: "left" }) },
  { key: "p17", displayName: "Gideon Larkspur", birthYear: 1954, sex: "male", condition: "parkinsons", conditionDetail: "Hoehn & Yahr 2", researchConsent: true, clinicians: ["clinician2"], weeks: 12, missedWeeks: [], trajectory: pd({ cadenceStart: 100, cadenceEnd: 110 }) },
  { key: "p18", displayName: "Rosalind Achterberg", birthYear: 1938, sex: "female", condition: "other", conditionDetail: "Fear of falling, slow gait", researchConsent: true, clinicians: ["clinician2"], weeks: 12, missedWeeks: [], trajectory: pd({ cadenceStart: 84, cadenceEnd: 96, strideCvStartPct: 6 }) },
];

export const DEMO_DEVICE_FIRMWARE = "2.4.1";
export const DEMO_SPARE_DEVICES = 6;

/** Serial numbers follow the service's own asset-tag pattern (invented). */
export function demoSerial(index: number): string {
  return `FHG-IMU-${String(index).padStart(4, "0")}`;
}
