import { assertPositiveFinite } from "../check";
import { ANGLE_HIGH_PASS_STRIDE_FRACTION, segmentAngleDeg } from "../coordination/segment-angle";
import { butterworthBandSections } from "../filter/butterworth-band-sections";
import { butterworthSections } from "../filter/butterworth-sections";
import { lowPassZeroPhase, sosFiltFilt3 } from "../filter/zero-phase-butterworth";
import { maskedSums3, projectOnAxis, sagittalAxis } from "./sagittal-axis";

/** The wrist's swing axis is sought in gyro band-passed to this band around the stride frequency (× f_stride, common practice). */
export const WRIST_AXIS_BAND: readonly [number, number] = [0.5, 2.6];
/**
 * The forward cue decides the sign only when its t statistic over steps reaches this and at least
 * `MIN_FORWARD_CUE_STEPS` steps contribute (common practice: |t| ≥ 3 is p < 0.005 two-sided for
 * ≥ 10 steps).
 */
export const MIN_FORWARD_CUE_T = 3;
export const MIN_FORWARD_CUE_STEPS = 10;
/**
 * … and its size reaches this (m/s²): the trunk's forward acceleration swings by roughly ±1 m/s²
 * each step in walking (Zijlstra & Hof 2003 show the pattern; the size is common practice), so a
 * difference under 0.1 m/s² is more likely what the arm model leaves over than the body.
 */
export const MIN_FORWARD_CUE_M_S2 = 0.1;
/** |cos| of the angle between a nominal axis and the measured direction needed to call it (60°, common practice). */
export const AXIS_CALL_COS = 0.5;
/** Heel-strike impacts at the wrist: acceleration above this (Hz) forms the impact envelope (common practice). */
export const IMPACT_HIGH_PASS_HZ = 8;
/** The impact lag is used only when the envelope at the best lag is this many times its median over lags (common practice). */
export const MIN_IMPACT_LAG_CONTRAST = 1.5;
/** Low-pass (Hz, zero phase) for the forward-cue regression: above the step rhythm's main harmonics, below impact ringing (common practice). */
export const CUE_LOW_PASS_HZ = 5;
/** Straight walking (s) the orientation is estimated from, at most: ~130 strides, ample for |t| ≥ 3 (common practice). */
export const MAX_ORIENTATION_WALKING_S = 150;
/** Data kept on each side of that span for the filters' edges (s). */
const ORIENTATION_MARGIN_S = 3;
const DEG = Math.PI / 180;
const G_M_S2 = 9.81;

type Vec3 = [number, number, number];

export interface WristOrientation {
  /** Unit axis in the sensor frame; gyro · rightAxis is the forearm's sagittal ω, forward (flexion) positive. */
  rightAxis: Vec3;
  /** True when the body's forward direction confirmed the sign; false when it fell back on the nominal axes. */
  verified: boolean;
  /** Gravity along the sensor's nominal forearm axis (+y) says the device hangs upside down (null: neither way). */
  upsideDown: boolean | null;
  /** The sensor's nominal forward axis (+x) faces backward (null when unverified or sideways). */
  turnedAround: boolean | null;
  /** The corrected ω has the opposite sign to the nominal +z reading. */
  flippedFromNominal: boolean;
  /** Forward cue: mean over steps of (acceleration just before IC − just after IC), its t and step count. */
  forwardCue: { meanM_S2: number; t: number; stepCount: number } | null;
  /** Share of band-passed gyro variance on the swing axis. */
  explainedVariance: number;
  /** Lag (s) of the wrist's own heel-strike impacts after the legs' ICs, used to time the cue; null when not found. */
  impactLagS: number | null;
}

export interface WristSignInput {
  accX: ArrayLike<number>;
  accY: ArrayLike<number>;
  accZ: ArrayLike<number>;
  gyroX: ArrayLike<number>;
  gyroY: ArrayLike<number>;
  gyroZ: ArrayLike<number>;
  /** 1 on straight, steady walking with valid wrist data (turns excluded). */
  mask: Uint8Array;
  sampleRateHz: number;
  strideFrequencyHz: number;
  /** Initial contacts of both legs (s, session time base), from the shank or foot events. */
  initialContactsS: readonly number[];
}

/**
 * Sagittal axis and sign of a wrist sensor from physics that does not involve the arm–leg phase.
 *
 * Axis: first principal component of the gyro band-passed to 0.5–2.6 × f_stride over straight
 * walking, with each sample's component along gravity removed first (the shoulder's flexion axis is
 * horizontal; turns and the trunk's yaw would tilt it).
 *
 * Up: the mean accelerometer vector over the same samples (gravity dominates; it points up along
 * the hanging forearm). Gravity along the nominal +y axis tells upright from upside-down wear.
 *
 * Sign: for the candidate right axis r, the candidate forward axis is f = up × r (x forward, y up,
 * z right is right-handed). Along f the wrist feels g·sin θ + L·α from its own swing about the
 * shoulder (θ = arm angle from the integrated ω, α = its angular acceleration; g is replaced by the
 * measured specific force along `up`, which also carries the body's vertical acceleration and heel
 * impacts; these terms flip with r, so they fit either sign equally) plus the body's own forward
 * acceleration, which does not flip: the
 * trunk accelerates forward before each initial contact and brakes after it (the anteroposterior
 * acceleration crosses zero from positive to negative at IC; Zijlstra & Hof 2003, Gait Posture
 * 18:1). So a_f is regressed on [1, sin θ, α], and for each IC (either leg) d = mean residual over
 * the half step before IC − over the half step after. mean(d) > 0 means f is forward. The sign is
 * decided only when |t| = |mean d| / (SD d / √K) ≥ 3 over K ≥ 10 steps and |mean d| ≥ 0.1 m/s²
 * (ICs shifted by the lag of the wrist's own heel-strike impacts when those stand out, so neither a
 * wrist clock offset nor the shank detector's latency can reverse the contrast)
 * (all columns and a_f low-passed alike at 5 Hz first); otherwise it falls back on
 * the nominal axes (the sensor's +x taken as forward, corrected for upside-down wear by gravity)
 * and `verified` is false. The expected arm–leg phase is never used.
 *
 * Returns null when there are too few straight-walking samples for an axis or no gravity reading.
 */
export function wristOrientation(input: WristSignInput): WristOrientation | null {
  const fs = input.sampleRateHz;
  assertPositiveFinite(fs, "sampleRateHz");
  assertPositiveFinite(input.strideFrequencyHz, "strideFrequencyHz");
  // Only the first MAX_ORIENTATION_WALKING_S of straight walking (plus filter margins) is used, so
  // the cost does not grow with the session; the wear does not change within a session.
  const total = input.mask.length;
  const margin = Math.round(ORIENTATION_MARGIN_S * fs);
  const [first, last] = leadingMaskedSpan(input.mask, MAX_ORIENTATION_WALKING_S * fs);
  if (first < 0) return null;
  const from = Math.max(0, first - margin);
  const to = Math.min(total, last + margin);
  const n = to - from;
  const mask = input.mask.subarray(from, to);
  const gyro = finiteOrZero3(input.gyroX, input.gyroY, input.gyroZ, from, n);
  const acc = finiteOrZero3(input.accX, input.accY, input.accZ, from, n);
  const shiftS = from / fs;
  const window: WristSignInput = {
    ...input,
    mask: input.mask.subarray(from, to),
    initialContactsS: input.initialContactsS.filter((t) => t >= shiftS && t < to / fs).map((t) => t - shiftS),
  };

  // Up: mean specific force over straight walking.
  const [count, upX, upY, upZ] = maskedSums3(acc[0], acc[1], acc[2], mask);
  const up: Vec3 = [upX, upY, upZ];
  if (count === 0) return null;
  const upNorm = Math.hypot(...up) / count;
  if (upNorm < 0.5 * G_M_S2) return null;
  normalise(up);

  // Swing axis from band-limited gyro, made horizontal.
  const lo = WRIST_AXIS_BAND[0] * input.strideFrequencyHz;
  const hi = Math.min(WRIST_AXIS_BAND[1] * input.strideFrequencyHz, 0.45 * fs);
  const bandSections = butterworthBandSections(2, lo, hi, fs);
  const band = sosFiltFilt3([bandSections, bandSections, bandSections], [gyro[0]!, gyro[1]!, gyro[2]!]);
  // Only rotation about horizontal axes counts: the trunk's yaw (about `up`) is removed first, so
  // an arm that hardly swings still gets its best horizontal axis rather than the yaw axis.
  removeComponentAlong(band[0]!, band[1]!, band[2]!, up);
  const pc = sagittalAxis(band[0]!, band[1]!, band[2]!, mask);
  if (!pc) return null;
  const right: Vec3 = [...pc.axis];
  const along = dot(right, up);
  for (let k = 0; k < 3; k++) right[k] = right[k]! - along * up[k]!;
  if (Math.hypot(...right) < 0.5) return null;
  normalise(right);
  const forward = cross(up, right);

  // Time the cue by the wrist's own heel-strike impacts: the leg ICs are detected on the shanks (with
  // their own latency) and the wrist clock may be off; a timing error beyond a quarter step would
  // reverse the before/after contrast. The lag is defined modulo one step, as is the cue.
  const impactLagS = impactLag(acc, window);
  const contacts = impactLagS === null ? window.initialContactsS : window.initialContactsS.map((t) => t + impactLagS);
  const forwardCue = bodyForwardCue(gyro, acc, right, forward, up, { ...window, initialContactsS: contacts });
  const nominalX: Vec3 = [1, 0, 0];
  const upsideDown = up[1] >= AXIS_CALL_COS ? false : up[1] <= -AXIS_CALL_COS ? true : null;
  let sign: 1 | -1;
  let verified = false;
  if (forwardCue && forwardCue.stepCount >= MIN_FORWARD_CUE_STEPS && Math.abs(forwardCue.t) >= MIN_FORWARD_CUE_T && Math.abs(forwardCue.meanM_S2) >= MIN_FORWARD_CUE_M_S2) {
    sign = forwardCue.t > 0 ? 1 : -1;
    verified = true;
  } else {
    // Nominal fallback: +x forward, so right = x × up.
    const nominalRight = cross(nominalX, up);
    sign = dot(nominalRight, right) >= 0 ? 1 : -1;
  }
  const rightAxis: Vec3 = [sign * right[0], sign * right[1], sign * right[2]];
  const fwd: Vec3 = [sign * forward[0], sign * forward[1], sign * forward[2]];
  const turnedAround = !verified ? null : fwd[0] <= -AXIS_CALL_COS ? true : fwd[0] >= AXIS_CALL_COS ? false : null;
  return {
    rightAxis,
    verified,
    upsideDown,
    turnedAround,
    flippedFromNominal: rightAxis[2] < 0,
    forwardCue: forwardCue && { ...forwardCue, t: sign * forwardCue.t, meanM_S2: sign * forwardCue.meanM_S2 },
    explainedVariance: pc.explainedVariance,
    impactLagS,
  };
}

/**
 * Lag in [−step/2, step/2) that maximises the mean of the wrist's impact envelope (high-passed
 * acceleration magnitude, 8 Hz, orientation-free) sampled at IC + lag over all ICs in the mask.
 * Null when the best lag does not stand out (contrast < 1.5 × the median over lags).
 */
function impactLag(acc: readonly Float64Array[], input: WristSignInput): number | null {
  const fs = input.sampleRateHz;
  const n = input.mask.length;
  if (IMPACT_HIGH_PASS_HZ >= 0.45 * fs) return null;
  const impactSections = butterworthSections("lowpass", 4, IMPACT_HIGH_PASS_HZ, fs);
  const low = sosFiltFilt3([impactSections, impactSections, impactSections], [acc[0]!, acc[1]!, acc[2]!]);
  const smooth = lowPassZeroPhase(differenceMagnitude(acc[0]!, acc[1]!, acc[2]!, low[0], low[1], low[2]), fs, Math.min(20, 0.4 * fs), 2);
  const halfStep = Math.round((0.25 * fs) / input.strideFrequencyHz);
  const ics = input.initialContactsS.map((t) => Math.round(t * fs)).filter((c) => c - halfStep >= 0 && c + halfStep < n && input.mask[c]);
  if (ics.length < MIN_FORWARD_CUE_STEPS) return null;
  const scores = meanAtLags(smooth, ics, halfStep);
  let best = 0;
  for (let k = 1; k < scores.length; k++) if (scores[k]! > scores[best]!) best = k;
  const sorted = [...scores].sort((x, y) => x - y);
  const median = sorted[sorted.length >> 1]!;
  if (!(scores[best]! >= MIN_IMPACT_LAG_CONTRAST * median)) return null;
  return (best - halfStep) / fs;
}

function bodyForwardCue(
  gyro: readonly Float64Array[],
  acc: readonly Float64Array[],
  right: Vec3,
  forward: Vec3,
  up: Vec3,
  input: WristSignInput,
): { meanM_S2: number; t: number; stepCount: number } | null {
  const fs = input.sampleRateHz;
  const n = input.mask.length;
  const omega = projectOnAxis(gyro[0]!, gyro[1]!, gyro[2]!, right);
  const af = projectOnAxis(acc[0]!, acc[1]!, acc[2]!, forward);
  const theta = segmentAngleDeg(omega, fs, ANGLE_HIGH_PASS_STRIDE_FRACTION * input.strideFrequencyHz);
  // α from ω low-passed at CUE_LOW_PASS_HZ: differentiating amplifies sensor noise, and noise in a
  // regressor shrinks its fitted coefficient, which would leave a fraction of the arm's large own
  // acceleration (L·α reaches ~10 m/s²) in the residual. Every column and the target get the same
  // filter (three series at a time through the three-channel filter, each result the same as its
  // own single-channel run).
  const cue = CUE_LOW_PASS_HZ < 0.45 * fs ? butterworthSections("lowpass", 4, CUE_LOW_PASS_HZ, fs) : null;
  const lp3 = (x: Float64Array, y: Float64Array, z: Float64Array): readonly [Float64Array, Float64Array, Float64Array] =>
    cue ? sosFiltFilt3([cue, cue, cue], [x, y, z]) : [x, y, z];
  // The arm's tilt projects the whole vertical specific force F (gravity plus the body's vertical
  // acceleration and impacts) onto the forward axis: F·sin θ, not g·sin θ.
  // The reading along `up` is F·cos θ + L·ω², so F·sin θ = (reading − L·ω²)·tan θ.
  const tanTheta = new Float64Array(n);
  const sinTheta = new Float64Array(n);
  tiltTerms(theta, acc[0]!, acc[1]!, acc[2]!, up, tanTheta, sinTheta);
  const [smooth, target, sinThetaLp] = lp3(omega, af, sinTheta);

  // Step template: +1 over the half step before each IC, −1 over the half step after.
  const halfStep = Math.max(1, Math.round((0.25 * fs) / input.strideFrequencyHz));
  const step = stepTemplate(n, input.initialContactsS, fs, halfStep);
  // Joint least squares a_f ≈ c0 + c1·sin θ + c2·α + β·step over the mask: fitting the template
  // together with the arm's own terms keeps the arm's step-frequency harmonics from absorbing it.
  // The up reading also holds the centripetal L·ω² of the swing, which sin θ carries onto the
  // forward axis, so it gets its own column.
  const alpha = new Float64Array(n);
  const centripetal = new Float64Array(n);
  armTerms(smooth, tanTheta, fs, alpha, centripetal);
  // The third series only fills the filter's third channel; its result is not used.
  const [alphaLp, centripetalLp] = lp3(alpha, centripetal, alpha);
  const cols = [sinThetaLp, alphaLp, centripetalLp, step];
  const m = cols.length + 1;
  const { ata, atb } = normalEquations(cols, target, input.mask);
  const coef = solveSymmetric(ata, atb, m);
  if (!coef) return null;
  // Per-step evidence on the signal with the arm's own terms removed (template kept in).
  const residual = residualOfArmTerms(target, coef, cols[0]!, cols[1]!, cols[2]!);

  const d = stepContrasts(residual, input.mask, input.initialContactsS, fs, halfStep);
  if (d.length < 2) return d.length === 0 ? null : { meanM_S2: d[0]!, t: 0, stepCount: d.length };
  const mean = d.reduce((a, x) => a + x, 0) / d.length;
  const sd = Math.sqrt(d.reduce((a, x) => a + (x - mean) ** 2, 0) / (d.length - 1));
  const t = sd > 0 ? mean / (sd / Math.sqrt(d.length)) : 0;
  return { meanM_S2: mean, t, stepCount: d.length };
}

// Sample loops live in the small functions below, not in wristOrientation or bodyForwardCue: a long
// loop inside those makes the engine compile the whole step (filters and all inlined) while it runs,
// several times over, which cost far more than the loops themselves on a session's first analysis.

/** [first masked index, index after the `count`-th masked sample (or length)]; first −1 when none. */
function leadingMaskedSpan(mask: Uint8Array, count: number): [number, number] {
  let first = -1;
  let seen = 0;
  for (let i = 0; i < mask.length; i++) {
    if (!mask[i]) continue;
    if (first < 0) first = i;
    if (++seen >= count) return [first, i + 1];
  }
  return [first, mask.length];
}

/** x, y, z [from, from + n) with non-finite values as 0, in one pass. */
function finiteOrZero3(x: ArrayLike<number>, y: ArrayLike<number>, z: ArrayLike<number>, from: number, n: number): [Float64Array, Float64Array, Float64Array] {
  const ox = new Float64Array(n);
  const oy = new Float64Array(n);
  const oz = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const u = x[from + i]!;
    const v = y[from + i]!;
    const w = z[from + i]!;
    ox[i] = Number.isFinite(u) ? u : 0;
    oy[i] = Number.isFinite(v) ? v : 0;
    oz[i] = Number.isFinite(w) ? w : 0;
  }
  return [ox, oy, oz];
}

/** Mean of x over the given indices shifted by each lag in [−halfStep, halfStep). */
function meanAtLags(x: Float64Array, at: readonly number[], halfStep: number): number[] {
  const scores: number[] = [];
  for (let lag = -halfStep; lag < halfStep; lag++) {
    let sum = 0;
    for (const c of at) sum += x[c + lag]!;
    scores.push(sum / at.length);
  }
  return scores;
}

/** Removes from each sample of (x, y, z) its component along the unit vector u, in place. */
function removeComponentAlong(x: Float64Array, y: Float64Array, z: Float64Array, u: Vec3): void {
  for (let i = 0; i < x.length; i++) {
    const along = x[i]! * u[0] + y[i]! * u[1] + z[i]! * u[2];
    x[i] = x[i]! - along * u[0];
    y[i] = y[i]! - along * u[1];
    z[i] = z[i]! - along * u[2];
  }
}

/** √((x − lx)² + (y − ly)² + (z − lz)²) per sample: the squares added in axis order, in one pass. */
function differenceMagnitude(x: Float64Array, y: Float64Array, z: Float64Array, lx: Float64Array, ly: Float64Array, lz: Float64Array): Float64Array {
  const out = new Float64Array(x.length);
  for (let i = 0; i < out.length; i++) out[i] = Math.sqrt((x[i]! - lx[i]!) ** 2 + (y[i]! - ly[i]!) ** 2 + (z[i]! - lz[i]!) ** 2);
  return out;
}

/**
 * tanTheta[i] = tan θ and sinTheta[i] = tan θ · (a · up): the tilt regressor F·sin θ from the reading
 * along `up` (see bodyForwardCue), with tan θ kept for the centripetal column.
 */
function tiltTerms(thetaDeg: Float64Array, ax: Float64Array, ay: Float64Array, az: Float64Array, up: Vec3, tanTheta: Float64Array, sinTheta: Float64Array): void {
  const [ux, uy, uz] = up;
  for (let i = 0; i < thetaDeg.length; i++) {
    const tan = Math.tan(thetaDeg[i]! * DEG);
    tanTheta[i] = tan;
    sinTheta[i] = tan * (ax[i]! * ux + ay[i]! * uy + az[i]! * uz);
  }
}

/**
 * alpha = angular acceleration (rad/s²) of ω (°/s) by central differences, 0 at both ends; and
 * centripetal = (ω in rad/s)² · tan θ.
 */
function armTerms(omegaDegS: Float64Array, tanTheta: Float64Array, sampleRateHz: number, alpha: Float64Array, centripetal: Float64Array): void {
  const n = omegaDegS.length;
  for (let i = 0; i < n; i++) {
    const w = omegaDegS[i]!;
    centripetal[i] = (w * DEG) ** 2 * tanTheta[i]!;
    if (i > 0 && i < n - 1) alpha[i] = ((omegaDegS[i + 1]! - omegaDegS[i - 1]!) * sampleRateHz * 0.5) * DEG;
  }
}

/** +1 over the half step before each IC, −1 over the half step after (later ICs overwrite). */
function stepTemplate(n: number, initialContactsS: readonly number[], sampleRateHz: number, halfStep: number): Float64Array {
  const step = new Float64Array(n);
  for (const ic of initialContactsS) {
    const c = Math.round(ic * sampleRateHz);
    for (let i = Math.max(0, c - halfStep); i < Math.min(n, c + halfStep); i++) step[i] = i < c ? 1 : -1;
  }
  return step;
}

/**
 * AᵀA and Aᵀb over the masked samples for A = [1, cols…]. AᵀA is symmetric (row[r]·row[c] =
 * row[c]·row[r] exactly), so only its upper half is summed and then mirrored.
 */
function normalEquations(cols: readonly Float64Array[], target: Float64Array, mask: Uint8Array): { ata: Float64Array; atb: Float64Array } {
  const m = cols.length + 1;
  const n = target.length;
  const ata = new Float64Array(m * m);
  const atb = new Float64Array(m);
  const row = new Float64Array(m);
  for (let i = 0; i < n; i++) {
    if (!mask[i]) continue;
    row[0] = 1;
    for (let k = 0; k < cols.length; k++) row[k + 1] = cols[k]![i]!;
    for (let r = 0; r < m; r++) {
      atb[r] = atb[r]! + row[r]! * target[i]!;
      for (let c = r; c < m; c++) ata[m * r + c] = ata[m * r + c]! + row[r]! * row[c]!;
    }
  }
  for (let r = 1; r < m; r++) for (let c = 0; c < r; c++) ata[m * r + c] = ata[m * c + r]!;
  return { ata, atb };
}

/** target − c0 − c1·a − c2·b − c3·c per sample (the fit's arm terms removed, the step template kept). */
function residualOfArmTerms(target: Float64Array, coef: readonly number[], a: Float64Array, b: Float64Array, c: Float64Array): Float64Array {
  const residual = new Float64Array(target.length);
  for (let i = 0; i < target.length; i++) residual[i] = target[i]! - coef[0]! - coef[1]! * a[i]! - coef[2]! * b[i]! - coef[3]! * c[i]!;
  return residual;
}

/** Per IC whose whole step window is masked: (Σ residual before IC − Σ after) / halfStep. */
function stepContrasts(residual: Float64Array, mask: Uint8Array, initialContactsS: readonly number[], sampleRateHz: number, halfStep: number): number[] {
  const n = residual.length;
  const d: number[] = [];
  for (const ic of initialContactsS) {
    const c = Math.round(ic * sampleRateHz);
    if (c - halfStep < 0 || c + halfStep > n) continue;
    let ok = true;
    let before = 0;
    let after = 0;
    for (let i = c - halfStep; i < c + halfStep; i++) {
      if (!mask[i]) {
        ok = false;
        break;
      }
      if (i < c) before += residual[i]!;
      else after += residual[i]!;
    }
    if (ok) d.push((before - after) / halfStep);
  }
  return d;
}

function dot(a: Vec3, b: Vec3): number {
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

function cross(a: Vec3, b: Vec3): Vec3 {
  return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
}

function normalise(v: Vec3): void {
  const m = Math.hypot(v[0], v[1], v[2]) || 1;
  v[0] /= m;
  v[1] /= m;
  v[2] /= m;
}

/** Solves an m × m system (row-major) by Gaussian elimination with partial pivoting; null when singular. */
function solveSymmetric(a: Float64Array, b: Float64Array, m: number): number[] | null {
  const A = Array.from({ length: m }, (_, r) => [...a.subarray(r * m, r * m + m), b[r]!]);
  for (let c = 0; c < m; c++) {
    let p = c;
    for (let r = c + 1; r < m; r++) if (Math.abs(A[r]![c]!) > Math.abs(A[p]![c]!)) p = r;
    const scale = Math.max(...A.map((row) => Math.abs(row[c]!)));
    if (!(Math.abs(A[p]![c]!) > 1e-12 * Math.max(1, scale))) return null;
    [A[c], A[p]] = [A[p]!, A[c]!];
    for (let r = 0; r < m; r++) {
      if (r === c) continue;
      const f = A[r]![c]! / A[c]![c]!;
      for (let k = c; k <= m; k++) A[r]![k] = A[r]![k]! - f * A[c]![k]!;
    }
  }
  return A.map((row, r) => row[m]! / row[r]!);
}
