// Guards for parameters passed by callers (programming errors). Data quirks in recordings are
// reported as SignalInputError or quality items instead, never through these.

export function assertPositiveFinite(value: number, name: string): void {
  if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) {
    throw new RangeError(`${name} must be a positive finite number, got ${String(value)}`);
  }
}

export function assertFiniteNumber(value: number, name: string): void {
  if (typeof value !== "number" || !Number.isFinite(value)) {
    throw new RangeError(`${name} must be a finite number, got ${String(value)}`);
  }
}

export function assertInteger(value: number, name: string, min: number, max = Number.MAX_SAFE_INTEGER): void {
  if (!Number.isInteger(value) || value < min || value > max) {
    throw new RangeError(`${name} must be an integer in [${min}, ${max}], got ${String(value)}`);
  }
}

export function assertSameLength(a: ArrayLike<number>, b: ArrayLike<number>, names: string): void {
  if (a.length !== b.length) {
    throw new RangeError(`${names} must have the same length (${a.length} vs ${b.length})`);
  }
}

export function assertCutoffBelowNyquist(cutoffHz: number, sampleRateHz: number, name: string): void {
  assertPositiveFinite(cutoffHz, name);
  if (cutoffHz >= sampleRateHz / 2) {
    throw new RangeError(`${name} (${cutoffHz} Hz) must be below the Nyquist frequency (${sampleRateHz / 2} Hz)`);
  }
}
