import { describe, expect, it } from "vitest";
import fixture from "./fixtures/scipy-filters.json";
import { butterworthSections } from "../butterworth-sections";
import { butterworthBandSections } from "../butterworth-band-sections";
import { lowPassZeroPhaseSegments, sosFiltFilt, sosFiltFilt3, zeroPhaseSegments3 } from "../zero-phase-butterworth";

// zeroPhaseSegments3 must equal three single-channel runs bit for bit (same operations in the same
// order), so the analysis' outputs do not move; the single-channel filter itself is checked against
// SciPy 1.17 `sosfiltfilt` in zero-phase-butterworth.test.ts, and once more here through the fixture.

function noisySines(n: number, seed: number): Float64Array {
  const x = new Float64Array(n);
  let s = seed;
  for (let i = 0; i < n; i++) {
    s = (s * 1103515245 + 12345) % 2147483648;
    x[i] = Math.sin(0.031 * i * seed) + 0.4 * Math.sin(0.7 * i) + (s / 2147483648 - 0.5);
  }
  return x;
}

describe("zeroPhaseSegments3(x, sections, valid)", () => {
  const n = 5000;
  const x = [noisySines(n, 1), noisySines(n, 2), noisySines(n, 3)] as const;
  const valid = new Uint8Array(n).fill(1);
  valid.fill(0, 1200, 1300); // a gap
  valid[2000] = 0;
  valid.fill(0, 2002, 2010); // with the hole at 2000, sample 2001 is a valid run of one sample
  valid.fill(0, 4990); // the end invalid

  it("equals three lowPassZeroPhaseSegments runs exactly, with a different cut-off per channel", () => {
    const cutoffs = [3, 15, 5];
    const sections = cutoffs.map((fc) => butterworthSections("lowpass", 4, fc, 200)) as [ReturnType<typeof butterworthSections>, ReturnType<typeof butterworthSections>, ReturnType<typeof butterworthSections>];
    const three = zeroPhaseSegments3(x, sections, valid);
    for (let c = 0; c < 3; c++) {
      const one = lowPassZeroPhaseSegments(x[c]!, valid, 200, cutoffs[c]!, 4);
      expect(Array.from(three[c]!)).toEqual(Array.from(one));
    }
  });

  it("equals the same filter on three channels, and copies invalid samples through", () => {
    const s = butterworthSections("lowpass", 4, 15, 200);
    const three = zeroPhaseSegments3(x, [s, s, s], valid);
    for (let c = 0; c < 3; c++) {
      expect(Array.from(three[c]!)).toEqual(Array.from(lowPassZeroPhaseSegments(x[c]!, valid, 200, 15, 4)));
      expect(three[c]![1250]).toBe(x[c]![1250]);
      expect(three[c]![2001]).toBe(x[c]![2001]);
      expect(three[c]![4995]).toBe(x[c]![4995]);
    }
  });

  it("with every sample valid equals SciPy sosfiltfilt(butter(4, 5, fs=100)) (fixture from signal/scripts/gen-filter-fixtures.py, 1e-9)", () => {
    // The fixture's input, by the formula it records (fixture.input.formula).
    const { n: m, sampleRateHz: fs } = fixture.input;
    const input = new Float64Array(m);
    for (let i = 0; i < m; i++) {
      const t = i / fs;
      const noise = ((i * 7919) % 101) / 101 - 0.5;
      input[i] = Math.sin(2 * Math.PI * 1.3 * t) + 0.5 * Math.sin(2 * Math.PI * 12 * t) + 0.2 * Math.cos(2 * Math.PI * 31 * t) + 0.3 * noise;
    }
    const s = butterworthSections("lowpass", 4, 5, fs);
    const all = new Uint8Array(m).fill(1);
    const [a, b, c] = zeroPhaseSegments3([input, input, input], [s, s, s], all);
    const single = sosFiltFilt(s, input);
    expect(Array.from(a)).toEqual(Array.from(single));
    expect(Array.from(b)).toEqual(Array.from(single));
    expect(Array.from(c)).toEqual(Array.from(single));
    let worst = 0;
    for (let i = 0; i < m; i++) worst = Math.max(worst, Math.abs(a[i]! - fixture.sosfiltfiltLow_4_5Hz[i]!));
    expect(worst).toBeLessThan(1e-9);
  });

  it("writes into arrays lent by the caller (stale contents overwritten) the same values as single-channel runs", () => {
    const s = butterworthSections("lowpass", 4, 8, 200);
    const lent: [Float64Array, Float64Array, Float64Array] = [new Float64Array(n).fill(Number.NaN), new Float64Array(n).fill(7), new Float64Array(n).fill(-3)];
    const three = zeroPhaseSegments3(x, [s, s, s], valid, lent);
    for (let c = 0; c < 3; c++) {
      expect(three[c]).toBe(lent[c]);
      expect(Array.from(three[c]!)).toEqual(Array.from(lowPassZeroPhaseSegments(x[c]!, valid, 200, 8, 4)));
    }
    const other = () => new Float64Array(n);
    expect(() => zeroPhaseSegments3(x, [s, s, s], valid, [other(), other(), new Float64Array(n - 1)])).toThrow(RangeError);
    expect(() => zeroPhaseSegments3(x, [s, s, s], valid, [other(), x[0], other()])).toThrow(RangeError);
    const same = other();
    expect(() => zeroPhaseSegments3(x, [s, s, s], valid, [same, other(), same])).toThrow(RangeError);
  });

  it("refuses cascades of different lengths and channels of different lengths", () => {
    const s4 = butterworthSections("lowpass", 4, 15, 200);
    const s2 = butterworthSections("lowpass", 2, 15, 200);
    expect(() => zeroPhaseSegments3(x, [s4, s4, s2], valid)).toThrow(RangeError);
    expect(() => zeroPhaseSegments3([x[0], x[1], x[2].subarray(1)], [s4, s4, s4], valid)).toThrow(RangeError);
  });
});

describe("sosFiltFilt3(sections, x)", () => {
  const n = 3000;
  const x = [noisySines(n, 4), noisySines(n, 5), noisySines(n, 6)] as const;

  it("equals three sosFiltFilt runs exactly (low-pass, band-pass, and a different cascade per channel)", () => {
    const low = butterworthSections("lowpass", 4, 15, 100);
    const band = butterworthBandSections(2, 0.5, 2.6, 100);
    const high = butterworthSections("highpass", 4, 15, 100);
    for (const sections of [[low, low, low], [band, band, band], [low, high, low]] as const) {
      const three = sosFiltFilt3(sections, x);
      for (let c = 0; c < 3; c++) expect(Array.from(three[c]!)).toEqual(Array.from(sosFiltFilt(sections[c]!, x[c]!)));
    }
  });

  it("equals SciPy sosfiltfilt(butter(4, 5, fs=100)) on the fixture's input (signal/scripts/gen-filter-fixtures.py, 1e-9)", () => {
    const { n: m, sampleRateHz: fs } = fixture.input;
    const input = new Float64Array(m);
    for (let i = 0; i < m; i++) {
      const t = i / fs;
      const noise = ((i * 7919) % 101) / 101 - 0.5;
      input[i] = Math.sin(2 * Math.PI * 1.3 * t) + 0.5 * Math.sin(2 * Math.PI * 12 * t) + 0.2 * Math.cos(2 * Math.PI * 31 * t) + 0.3 * noise;
    }
    const s = butterworthSections("lowpass", 4, 5, fs);
    const [a] = sosFiltFilt3([s, s, s], [input, input.map((v) => -v), input]);
    let worst = 0;
    for (let i = 0; i < m; i++) worst = Math.max(worst, Math.abs(a[i]! - fixture.sosfiltfiltLow_4_5Hz[i]!));
    expect(worst).toBeLessThan(1e-9);
  });

  it("passes a single sample through, returns empty channels for empty input, and refuses mismatched lengths", () => {
    const s = butterworthSections("lowpass", 4, 15, 200);
    expect(sosFiltFilt3([s, s, s], [[1.5], [2.5], [-3]]).map((c) => Array.from(c))).toEqual([[1.5], [2.5], [-3]]);
    expect(sosFiltFilt3([s, s, s], [[], [], []]).map((c) => c.length)).toEqual([0, 0, 0]);
    expect(() => sosFiltFilt3([s, s, butterworthSections("lowpass", 2, 15, 200)], x)).toThrow(RangeError);
    expect(() => sosFiltFilt3([s, s, s], [x[0], x[1], x[2].subarray(1)])).toThrow(RangeError);
  });
});
