import { dft, inverseDft } from "./dft";

/**
 * Analytic signal z = x + i·H[x], computed like SciPy's `scipy.signal.hilbert(x)` with its
 * default N = len(x): DFT of exactly N samples (no padding, any N), positive frequencies doubled,
 * negative ones zeroed, DC (and Nyquist for even N) kept, inverse DFT. The signal is treated as
 * one period of a periodic sequence, so the ends distort unless the data hold whole cycles;
 * callers discard edge samples. `re` equals x to rounding.
 */
export function hilbert(x: ArrayLike<number>): { re: Float64Array; im: Float64Array } {
  const n = x.length;
  if (n === 0) return { re: new Float64Array(0), im: new Float64Array(0) };
  const spectrum = dft(x, null);
  const half = Math.floor(n / 2);
  // h = [1, 2, …, 2, (1 at N/2 if N even), 0, …, 0]
  for (let k = 1; k < n; k++) {
    let h: number;
    if (n % 2 === 0) h = k < half ? 2 : k === half ? 1 : 0;
    else h = k <= half ? 2 : 0;
    spectrum.re[k] = spectrum.re[k]! * h;
    spectrum.im[k] = spectrum.im[k]! * h;
  }
  return inverseDft(spectrum.re, spectrum.im);
}

/** Instantaneous phase atan2(Im z, Re z) in radians, (−π, π], of the analytic signal of x. */
export function hilbertPhase(x: ArrayLike<number>): Float64Array {
  const z = hilbert(x);
  const phase = new Float64Array(x.length);
  for (let i = 0; i < phase.length; i++) phase[i] = Math.atan2(z.im[i]!, z.re[i]!);
  return phase;
}

/**
 * Instantaneous phases of two real signals of the same length, as `hilbertPhase` gives for each:
 * atan2(H[x], x). The Hilbert transform is linear and maps real signals to real ones, so
 * H[x + i·y] = H[x] + i·H[y]: one DFT of x + i·y, the spectrum multiplied by −i·sgn(k) (DC and, for
 * even N, Nyquist zeroed — the `h` weights of `hilbert` less the identity), one inverse DFT, and the
 * real and imaginary parts are H[x] and H[y]. Two transforms instead of four; equal to
 * `hilbertPhase` of each signal to rounding.
 */
export function hilbertPhasePair(x: ArrayLike<number>, y: ArrayLike<number>): [Float64Array, Float64Array] {
  const n = x.length;
  if (y.length !== n) throw new RangeError(`x and y must have the same length (${n} vs ${y.length})`);
  const px = new Float64Array(n);
  const py = new Float64Array(n);
  if (n === 0) return [px, py];
  const z = dft(x, y);
  timesMinusISign(z.re, z.im);
  const h = inverseDft(z.re, z.im);
  phaseInto(px, h.re, x);
  phaseInto(py, h.im, y);
  return [px, py];
}

// The loops are small functions of their own (see dft.ts): compiled once, not mid-call.

/** Spectrum ·= −i·sgn(k), with DC and (for even N) Nyquist zeroed. */
function timesMinusISign(re: Float64Array, im: Float64Array): void {
  const n = re.length;
  const half = Math.floor(n / 2);
  for (let k = 0; k < n; k++) {
    const s = k === 0 || (n % 2 === 0 && k === half) ? 0 : k <= half ? 1 : -1;
    const r = re[k]!;
    re[k] = s * im[k]!;
    im[k] = -s * r;
  }
}

/** out[i] = atan2(h[i], x[i]). */
function phaseInto(out: Float64Array, h: Float64Array, x: ArrayLike<number>): void {
  for (let i = 0; i < out.length; i++) out[i] = Math.atan2(h[i]!, x[i]!);
}
