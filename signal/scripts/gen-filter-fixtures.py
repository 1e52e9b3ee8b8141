"""Regenerates signal/src/filter/__tests__/fixtures/scipy-filters.json with SciPy (1.17) values.

Run from the repository root:  python3 signal/scripts/gen-filter-fixtures.py
The test input is defined by a formula so the TypeScript test can rebuild it exactly.
"""
import json
import pathlib

import numpy as np
import scipy
from scipy import signal

OUT = pathlib.Path(__file__).resolve().parent.parent / "src/filter/__tests__/fixtures/scipy-filters.json"


def test_input(n, fs):
    i = np.arange(n)
    t = i / fs
    noise = ((i * 7919) % 101) / 101.0 - 0.5
    return np.sin(2 * np.pi * 1.3 * t) + 0.5 * np.sin(2 * np.pi * 12 * t) + 0.2 * np.cos(2 * np.pi * 31 * t) + 0.3 * noise


def coeffs(order, fc, fs, btype="low"):
    b, a = signal.butter(order, fc, btype=btype, fs=fs)
    return {"order": order, "cutoffHz": fc, "sampleRateHz": fs, "btype": btype, "b": b.tolist(), "a": a.tolist()}


fs = 100.0
x = test_input(1000, fs)
low = signal.sosfiltfilt(signal.butter(4, 5, fs=fs, output="sos"), x)
band_true = signal.sosfiltfilt(signal.butter(2, [0.8, 1.6], "band", fs=fs, output="sos"), x)

fixture = {
    "generator": f"scipy {scipy.__version__}, numpy {np.__version__}",
    "coefficients": [coeffs(4, 5, 100), coeffs(4, 5, 128), coeffs(4, 2, 100), coeffs(2, 20, 100), coeffs(4, 0.5, 100, "high")],
    "input": {"n": 1000, "sampleRateHz": fs, "formula": "sin(2pi1.3t)+0.5sin(2pi12t)+0.2cos(2pi31t)+0.3(((i*7919)%101)/101-0.5)"},
    "sosfiltfiltLow_4_5Hz": low.tolist(),
    "sosfiltfiltBand_2_0p8_1p6Hz": band_true.tolist(),
}
OUT.write_text(json.dumps(fixture, indent=1) + "\n")
print(f"wrote {OUT}")
