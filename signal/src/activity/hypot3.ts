/**
 * √(x² + y² + z²) with exactly the arithmetic of V8's `Math.hypot` (deps/v8/src/builtins/
 * builtins-math.cc: scale by the largest magnitude, Kahan-compensated sum of squares in argument
 * order, √sum × max), so results are bit-identical to `Math.hypot(x, y, z)` in Node and Chromium.
 * `Math.hypot` is a C++ runtime builtin that boxes its arguments and result; this inlines.
 */
export function hypot3(x: number, y: number, z: number): number {
  const ax = Math.abs(x);
  const ay = Math.abs(y);
  const az = Math.abs(z);
  if (ax !== ax || ay !== ay || az !== az) {
    return ax === Infinity || ay === Infinity || az === Infinity ? Infinity : Number.NaN;
  }
  let max = ax;
  if (max < ay) max = ay;
  if (max < az) max = az;
  if (max === Infinity) return Infinity;
  if (max === 0) return 0;
  let sum = 0;
  let compensation = 0;
  let n = ax / max;
  let summand = n * n - compensation;
  let preliminary = sum + summand;
  compensation = preliminary - sum - summand;
  sum = preliminary;
  n = ay / max;
  summand = n * n - compensation;
  preliminary = sum + summand;
  compensation = preliminary - sum - summand;
  sum = preliminary;
  n = az / max;
  summand = n * n - compensation;
  preliminary = sum + summand;
  sum = preliminary;
  return Math.sqrt(sum) * max;
}
