// Loads the SciPy/NumPy reference values written by signal/fixtures/generate_fixtures.py.
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";

export interface ScipyReference {
  numpy: string;
  scipy: string;
  hilbert: { n: number; x: number[]; re: number[]; im: number[] }[];
  bandpass: {
    fs: number;
    f0: number;
    lowHz: number;
    highHz: number;
    x: number[];
    y: number[];
    responseHz: number[];
    responseMagnitude: number[];
  }[];
  lowpass: { order: number; cutoffHz: number; fs: number; responseHz: number[]; responseMagnitude: number[] };
  circular: { anglesRad: number[]; circmean: number; circstd: number; circvar: number }[];
  welch: { name: string; fs: number; nperseg: number; x: number[]; f: number[]; psd: number[]; peakHz: number }[];
}

export const scipyReference: ScipyReference = JSON.parse(
  readFileSync(fileURLToPath(new URL("../../../fixtures/scipy-fixtures.json", import.meta.url)), "utf8"),
) as ScipyReference;
