"""A plain NumPy/SciPy pipeline over the same four sensor CSV files, for the whole-process
comparison in `npm run bench` (signal/bench/bench.ts runs it alternately with the built CLI).

    python3 signal/bench/numpy_pipeline.py <file.csv>...

Not part of the product and not a reference for its numbers: it does the same kinds of work on the
same data with the library calls a NumPy/SciPy user would reach for, so the timing comparison is
fair. Steps, in the order the TypeScript analysis does them (cut-offs and orders as there):

 1. parse each CSV with numpy.loadtxt (header lines read as text first, as our reader does);
 2. resample every channel to one common 200 Hz grid with numpy.interp;
 3. walking mask: 1 s moving mean of the leg gyroscope magnitude above 15 deg/s;
 4. per shank: sagittal axis by PCA (numpy.linalg.eigh of the 3x3 covariance over walking),
    projection of the gyroscope on it;
 5. per shank: zero-phase Butterworth low-pass (scipy.signal.butter(..., output="sos") and
    sosfiltfilt) at 3 Hz, 15 Hz and 5 Hz, order 4; mid-swing peaks with scipy.signal.find_peaks,
    initial and final contact as the minima of the 15 Hz signal after and before each peak;
 6. impact envelopes: per sensor, the three accelerometer axes minus their 15 Hz low-pass, summed
    squares; leg-to-leg and wrist-to-leg clock offsets by FFT cross-correlation
    (scipy.signal.correlate, method="fft") within +-0.5 s;
 7. turns: gravity by a 0.5 Hz order-2 low-pass of each leg's accelerometer, yaw rate as the
    gyroscope along gravity, 1 Hz order-2 low-pass;
 8. wrists: order-2 band-pass of the three gyroscope axes around the stride frequency, 8 Hz impact
    residual, 5 Hz order-4 cue low-pass;
 9. stride times, cadence, stride-time CV per leg and a Phase Coordination Index from the initial
    contacts (Plotnik et al. 2007 definition);
10. arm-leg coordination per arm: segment angles (cumulative integral minus a 0.25 x stride
    frequency order-2 low-pass), Welch PSD (scipy.signal.welch, Hann, 20 s segments rounded up to a
    power of two, 50 % overlap) for the arm's dominant frequency, order-4 Butterworth band-pass
    0.7-1.3 x fundamental of arm and leg angles with sosfiltfilt, Hilbert phase
    (scipy.signal.hilbert), mean relative phase and its resultant length.

It prints one JSON line (a few numbers, so the work cannot be skipped).
"""

import json
import sys

import numpy as np
from scipy import signal

GRID_HZ = 200.0


def read_sensor_csv(path):
    meta = {}
    header_lines = 0
    with open(path, "r", encoding="utf-8") as f:
        for line in f:
            header_lines += 1
            if line.startswith("#"):
                key, _, value = line[1:].partition(":")
                meta[key.strip()] = value.strip()
            else:
                break  # the column-name line
    data = np.loadtxt(path, delimiter=",", skiprows=header_lines, dtype=np.float64)
    return meta, data


def lowpass(x, fs, hz, order):
    return signal.sosfiltfilt(signal.butter(order, hz, btype="low", fs=fs, output="sos"), x)


def bandpass(x, fs, lo, hi, order):
    return signal.sosfiltfilt(signal.butter(order, [lo, hi], btype="band", fs=fs, output="sos"), x)


def impact_envelope(acc, fs):
    return sum((a - lowpass(a, fs, 15.0, 4)) ** 2 for a in acc)


def lag_s(a, b, fs, max_s=0.5):
    c = signal.correlate(a - a.mean(), b - b.mean(), mode="full", method="fft")
    lags = signal.correlation_lags(len(a), len(b), mode="full")
    keep = np.abs(lags) <= int(max_s * fs)
    return float(lags[keep][np.argmax(c[keep])] / fs)


def shank_events(omega, fs):
    ms = lowpass(omega, fs, 3.0, 4)
    ev = lowpass(omega, fs, 15.0, 4)
    lobe = lowpass(omega, fs, 5.0, 4)
    peaks, _ = signal.find_peaks(ms, height=50.0, distance=int(0.4 * fs))
    ic, fc = [], []
    half = int(0.5 * fs)
    for p in peaks:
        after = ev[p : p + half]
        before = ev[max(0, p - half) : p]
        if len(after) > 2:
            ic.append(p + int(np.argmin(after)))
        if len(before) > 2:
            fc.append(p - len(before) + int(np.argmin(before)))
    return np.array(ic), np.array(fc), float(np.max(lobe))


def segment_angle(omega, fs, stride_hz):
    angle = np.cumsum(omega) / fs
    return angle - lowpass(angle, fs, 0.25 * stride_hz, 2)


def main(paths):
    recordings = {}
    for p in paths:
        meta, data = read_sensor_csv(p)
        recordings[meta.get("placement", p)] = data
    start = max(d[0, 0] for d in recordings.values())
    end = min(d[-1, 0] for d in recordings.values())
    grid = np.arange(start, end, 1.0 / GRID_HZ)
    fs = GRID_HZ
    sensors = {k: np.stack([np.interp(grid, d[:, 0], d[:, c]) for c in range(1, 7)]) for k, d in recordings.items()}
    legs = [k for k in ("left_shank", "right_shank") if k in sensors]
    wrists = [k for k in ("left_wrist", "right_wrist") if k in sensors]

    mag = np.mean([np.linalg.norm(sensors[k][3:6], axis=0) for k in legs], axis=0)
    walking = np.convolve(mag, np.ones(int(fs)) / fs, mode="same") > 15.0

    omega, events = {}, {}
    for k in legs:
        g = sensors[k][3:6]
        w, v = np.linalg.eigh(np.cov(g[:, walking]))
        axis = v[:, np.argmax(w)]
        if axis[2] < 0:
            axis = -axis
        omega[k] = axis @ g
        events[k] = shank_events(omega[k], fs)

    envelopes = {k: impact_envelope(sensors[k][0:3], fs) for k in sensors}
    offsets = {}
    if len(legs) == 2:
        offsets["right_shank"] = lag_s(envelopes[legs[0]], envelopes[legs[1]], fs)
    leg_env = sum(envelopes[k] for k in legs)
    for k in wrists:
        offsets[k] = lag_s(envelopes[k], leg_env, fs)

    yaw = []
    for k in legs:
        acc, gyro = sensors[k][0:3], sensors[k][3:6]
        grav = np.stack([lowpass(a, fs, 0.5, 2) for a in acc])
        grav /= np.linalg.norm(grav, axis=0)
        yaw.append(lowpass(np.sum(gyro * grav, axis=0), fs, 1.0, 2))
    turning = np.abs(np.mean(yaw, axis=0)) > 15.0

    # Strides inside the wide physiological limits 0.25-6 s (the rests and long gaps drop out).
    stride_s = {k: (lambda s: s[(s > 0.25) & (s < 6)])(np.diff(events[k][0]) / fs) for k in legs}
    all_strides = np.concatenate(list(stride_s.values()))
    stride_hz = 1.0 / float(np.median(all_strides))
    cadence = 120.0 * stride_hz
    cv = {k: float(np.std(s) / np.mean(s) * 100) for k, s in stride_s.items()}
    pci = None
    if len(legs) == 2:
        left, right = events[legs[0]][0], events[legs[1]][0]
        phis = []
        for a, b in zip(left[:-1], left[1:]):
            r = right[(right > a) & (right < b)]
            if len(r):
                phis.append(360.0 * (r[0] - a) / (b - a))
        phis = np.array(phis)
        pci = float(100 * np.mean(np.abs(phis - 180) / 180) + 100 * np.std(phis) / np.mean(phis))

    coupling = {}
    for k in wrists:
        gyro = sensors[k][3:6]
        band = np.stack([bandpass(g, fs, 0.5 * stride_hz, 2.5 * stride_hz, 2) for g in gyro])
        residual = impact_envelope(sensors[k][0:3], fs)
        cue = lowpass(np.sqrt(residual), fs, 5.0, 4)
        w, v = np.linalg.eigh(np.cov(band[:, walking]))
        arm_omega = v[:, np.argmax(w)] @ gyro
        arm = segment_angle(arm_omega, fs, stride_hz)
        leg = segment_angle(omega[legs[0]], fs, stride_hz)
        seg = 2 ** int(np.ceil(np.log2(20 * fs)))
        f, psd = signal.welch(arm[walking], fs=fs, window="hann", nperseg=seg, noverlap=seg // 2)
        search = (f > 0.4 * stride_hz) & (f < 2.6 * stride_hz)
        arm_hz = float(f[search][np.argmax(psd[search])])
        arm_band = bandpass(arm, fs, 0.7 * arm_hz, 1.3 * arm_hz, 4)
        leg_band = bandpass(leg, fs, 0.7 * stride_hz, 1.3 * stride_hz, 4)
        rel = np.angle(signal.hilbert(arm_band)) - np.angle(signal.hilbert(leg_band))
        z = np.mean(np.exp(1j * rel[walking & ~turning]))
        coupling[k] = {"armHz": arm_hz, "phaseDeg": float(np.degrees(np.angle(z))), "R": float(np.abs(z)), "cue": float(cue.max())}

    print(
        json.dumps(
            {
                "samples": int(len(grid)),
                "walkingFraction": float(walking.mean()),
                "events": {k: [len(e[0]), len(e[1])] for k, e in events.items()},
                "cadenceStepsPerMin": cadence,
                "strideTimeCvPct": cv,
                "pci": pci,
                "clockOffsetsS": offsets,
                "coupling": coupling,
            }
        )
    )


if __name__ == "__main__":
    if len(sys.argv) < 2:
        sys.exit("usage: numpy_pipeline.py <file.csv>...")
    main(sys.argv[1:])
