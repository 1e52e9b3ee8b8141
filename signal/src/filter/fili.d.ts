// Types for the parts of fili 2.0.3 that Pendula uses (the package ships no declarations).
// fili builds IIR filters as cascades of biquads; `order` there is the number of biquads,
// so a Butterworth filter of order N needs `order: N / 2`.
declare module "fili" {
  export interface FiliBiquad {
    /** Feedback coefficients a1, a2 (a0 normalised to 1). */
    a: [number, number];
    /** Feed-forward coefficients b0, b1, b2 (before the gain `k`). */
    b: [number, number, number];
    /** Gain applied to the section input. */
    k: number;
    a0: number;
    z: [number, number];
  }

  export interface FiliCascadeParams {
    order: number;
    characteristic: "butterworth" | "bessel";
    Fs: number;
    Fc: number;
    BW?: number;
    gain?: number;
    preGain?: boolean;
  }

  export class CalcCascades {
    lowpass(params: FiliCascadeParams): FiliBiquad[];
    highpass(params: FiliCascadeParams): FiliBiquad[];
    bandpass(params: FiliCascadeParams): FiliBiquad[];
    available(): string[];
  }

  export class IirFilter {
    constructor(cascade: FiliBiquad[]);
    multiStep(input: ArrayLike<number>, overwrite?: boolean): number[];
    filtfilt(input: ArrayLike<number>, overwrite?: boolean): number[];
    singleStep(input: number): number;
  }

  const fili: { CalcCascades: typeof CalcCascades; IirFilter: typeof IirFilter };
  export default fili;
}
