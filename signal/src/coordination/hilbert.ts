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
