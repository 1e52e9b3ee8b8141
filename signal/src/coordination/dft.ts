import FFT from "fft.js";

// Discrete Fourier transform of any length. Powers of two go straight to fft.js (radix-4);
// other lengths use Bluestein's chirp-z algorithm on a power-of-two convolution, so results
// match an exact DFT (and SciPy's pocketfft) to rounding, with no zero-padding of the data.
// Bluestein: X_k = c_k · Σ_n (x_n c_n) · conj(c_{k−n}), c_k = exp(−iπk²/N)
// (L. Bluestein 1970; see e.g. https://en.wikipedia.org/wiki/Chirp_Z-transform#Bluestein's_algorithm).

interface BluesteinPlan {
  n: number;
  m: number;
  fft: FFT;
  /** Chirp c_k = exp(−iπk²/N), interleaved re/im, length 2N. */
  chirp: Float64Array;
  /** FFT of the conjugate chirp filter, length 2M interleaved. */
  filterSpectrum: Float64Array;
  /** Work buffers of length 2M, reused by every transform of this size. */
  work: Float64Array;
  workSpectrum: Float64Array;
}

// fft.js accepts any indexable buffers; Float64Array avoids its boxed Array (createComplexArray).

// Plans are cached by size: the analysis transforms a few signals of one length per session.
// Small ones stay for the process. Large ones (a 30-minute session's 2²⁰-point Bluestein plan is
// ~70 MB with its fft.js tables) are held through a WeakRef: a WeakRef's target survives at least
// until the current synchronous job ends, so within one analyze() call the forward and inverse
// transforms of every Hilbert pair share one plan (it used to be rebuilt four times per arm),
// and the memory is released once the analysis returns. Plans are pure functions of the size, so
// reuse changes no value.
const SMALL_PLAN_MAX = 1 << 18;
const fftCache = new Map<number, FFT>();
let largeFft: WeakRef<FFT> | null = null;
let largeFftSize = 0;
let lastPlan: BluesteinPlan | null = null;
let lastLargePlan: WeakRef<BluesteinPlan> | null = null;

function fftOfSize(size: number): FFT {
  if (size > SMALL_PLAN_MAX) {
    let big = largeFftSize === size ? largeFft?.deref() : undefined;
    if (!big) {
      big = new FFT(size);
      largeFft = new WeakRef(big);
      largeFftSize = size;
    }
    return big;
  }
  let f = fftCache.get(size);
  if (!f) {
    if (fftCache.size > 8) fftCache.clear();
    f = new FFT(size);
    fftCache.set(size, f);
  }
  return f;
}

function isPowerOfTwo(n: number): boolean {
  return n >= 2 && (n & (n - 1)) === 0;
}

function bluesteinPlan(n: number): BluesteinPlan {
  if (lastPlan && lastPlan.n === n) return lastPlan;
  const large = lastLargePlan?.deref();
  if (large && large.n === n) return large;
  let m = 2;
  while (m < 2 * n - 1) m *= 2;
  const fft = fftOfSize(m);
  const chirp = new Float64Array(2 * n);
  fillChirp(chirp, n);
  const filter = new Float64Array(2 * m);
  fillChirpFilter(filter, chirp, n, m);
  const filterSpectrum = new Float64Array(2 * m);
  fft.transform(filterSpectrum, filter);
  const plan = { n, m, fft, chirp, filterSpectrum, work: filter, workSpectrum: new Float64Array(2 * m) };
  // At most one plan of each kind; a large one only weakly (see above), so a single transform of
  // a long signal does not pin its buffers for the rest of the process.
  if (m <= SMALL_PLAN_MAX) lastPlan = plan;
  else lastLargePlan = new WeakRef(plan);
  return plan;
}

/**
 * Forward DFT X_k = Σ x_n e^{−2πikn/N} of a complex sequence given as separate real and imaginary
 * parts (imag may be null for real input). Returns new arrays; inputs are not modified.
 */
export function dft(
  real: ArrayLike<number>,
  imag: ArrayLike<number> | null,
): { re: Float64Array; im: Float64Array } {
  const n = real.length;
  if (imag && imag.length !== n) throw new RangeError(`real and imag must have the same length (${n} vs ${imag.length})`);
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  if (n === 0) return { re, im };
  if (n === 1) {
    re[0] = real[0]!;
    im[0] = imag ? imag[0]! : 0;
    return { re, im };
  }
  if (isPowerOfTwo(n)) {
    const fft = fftOfSize(n);
    const input = new Float64Array(2 * n);
    interleave(input, real, imag);
    const out = new Float64Array(2 * n);
    fft.transform(out, input);
    deinterleave(re, im, out);
    return { re, im };
  }
  const plan = bluesteinPlan(n);
  const { fft, chirp, filterSpectrum } = plan;
  const a = plan.work;
  a.fill(0);
  chirpTimes(a, real, imag, chirp);
  const spectrum = plan.workSpectrum;
  fft.transform(spectrum, a);
  multiplyInPlace(spectrum, filterSpectrum);
  // fft.js's inverseTransform divides by the size M, which is what the convolution needs.
  fft.inverseTransform(a, spectrum);
  chirpTimesInterleaved(re, im, a, chirp);
  return { re, im };
}

/** Inverse DFT x_n = (1/N) Σ X_k e^{+2πikn/N}, via conj(DFT(conj X))/N. */
export function inverseDft(real: ArrayLike<number>, imag: ArrayLike<number>): { re: Float64Array; im: Float64Array } {
  const n = real.length;
  const negImag = new Float64Array(n);
  negateInto(negImag, imag);
  const out = dft(real, negImag);
  scaleConjugateInPlace(out.re, out.im, n);
  return out;
}

// The sample loops are small functions of their own that end in a plain return. A session calls
// dft a handful of times on long signals; with the loops inline, the whole of dft was compiled in
// the middle of its first loop and dropped when the next loop began, several times per call.

/** Chirp c_k = exp(−iπk²/N) interleaved; k² mod 2N keeps the angle small, so it stays exact to rounding for large N. */
function fillChirp(chirp: Float64Array, n: number): void {
  let k2 = 0;
  const twoN = 2 * n;
  for (let k = 0; k < n; k++) {
    const angle = (-Math.PI * k2) / n;
    chirp[2 * k] = Math.cos(angle);
    chirp[2 * k + 1] = Math.sin(angle);
    k2 = (k2 + 2 * k + 1) % twoN;
  }
}

/** The conjugate chirp as a circular convolution kernel of length M: conj(c_k) at k and at M − k. */
function fillChirpFilter(filter: Float64Array, chirp: Float64Array, n: number, m: number): void {
  filter[0] = chirp[0]!;
  filter[1] = -chirp[1]!;
  for (let k = 1; k < n; k++) {
    const re = chirp[2 * k]!;
    const im = -chirp[2 * k + 1]!;
    filter[2 * k] = re;
    filter[2 * k + 1] = im;
    filter[2 * (m - k)] = re;
    filter[2 * (m - k) + 1] = im;
  }
}

/** out = real + i·imag interleaved (imag null: 0). */
function interleave(out: Float64Array, real: ArrayLike<number>, imag: ArrayLike<number> | null): void {
  for (let i = 0; i < real.length; i++) {
    out[2 * i] = real[i]!;
    out[2 * i + 1] = imag ? imag[i]! : 0;
  }
}

/** re, im = the first re.length complex values of the interleaved z. */
function deinterleave(re: Float64Array, im: Float64Array, z: Float64Array): void {
  for (let i = 0; i < re.length; i++) {
    re[i] = z[2 * i]!;
    im[i] = z[2 * i + 1]!;
  }
}

/** a[k] = (real[k] + i·imag[k]) · c_k interleaved, for k < N (imag null: 0). */
function chirpTimes(a: Float64Array, real: ArrayLike<number>, imag: ArrayLike<number> | null, chirp: Float64Array): void {
  for (let k = 0; k < real.length; k++) {
    const xr = real[k]!;
    const xi = imag ? imag[k]! : 0;
    const cr = chirp[2 * k]!;
    const ci = chirp[2 * k + 1]!;
    a[2 * k] = xr * cr - xi * ci;
    a[2 * k + 1] = xr * ci + xi * cr;
  }
}

/** spectrum ·= filter, complex, interleaved, elementwise. */
function multiplyInPlace(spectrum: Float64Array, filter: Float64Array): void {
  for (let k = 0; k < spectrum.length >> 1; k++) {
    const ar = spectrum[2 * k]!;
    const ai = spectrum[2 * k + 1]!;
    const br = filter[2 * k]!;
    const bi = filter[2 * k + 1]!;
    spectrum[2 * k] = ar * br - ai * bi;
    spectrum[2 * k + 1] = ar * bi + ai * br;
  }
}

/** re[k] + i·im[k] = y_k · c_k for k < N, y interleaved. */
function chirpTimesInterleaved(re: Float64Array, im: Float64Array, y: Float64Array, chirp: Float64Array): void {
  for (let k = 0; k < re.length; k++) {
    const yr = y[2 * k]!;
    const yi = y[2 * k + 1]!;
    const cr = chirp[2 * k]!;
    const ci = chirp[2 * k + 1]!;
    re[k] = yr * cr - yi * ci;
    im[k] = yr * ci + yi * cr;
  }
}

function negateInto(out: Float64Array, x: ArrayLike<number>): void {
  for (let i = 0; i < out.length; i++) out[i] = -x[i]!;
}

/** (re, im) ← (re / n, −im / n). */
function scaleConjugateInPlace(re: Float64Array, im: Float64Array, n: number): void {
  for (let i = 0; i < re.length; i++) {
    re[i] = re[i]! / n;
    im[i] = -im[i]! / n;
  }
}
