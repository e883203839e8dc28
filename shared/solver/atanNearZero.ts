/**
 * atan(x) in radians, fast for small |x|: for |x| ≤ 0.1 the Maclaurin series
 * x − x³/3 + x⁵/5 − … through x¹⁵ (through x⁷ when |x| < 0.01; truncation below 1e-17
 * relative either way), pure arithmetic that the JIT inlines; larger |x| falls back to
 * Math.atan.
 *
 * The march uses it for the small angle differences between neighbouring facets and fan states,
 * where Math.atan's call overhead would dominate the cost.
 *
 * Source: Maclaurin series of atan (common practice).
 */
export function atanNearZero(x: number): number {
  if (!(x <= 0.1 && x >= -0.1)) return Math.atan(x);
  const z = x * x;
  // |x| < 0.01: the terms after x⁷/7 are below 1e-17 relative, so stop there.
  if (z < 1e-4) return x * (1 + z * (-1 / 3 + z * (1 / 5 + z * (-1 / 7))));
  return (
    x *
    (1 +
      z *
        (-1 / 3 +
          z * (1 / 5 + z * (-1 / 7 + z * (1 / 9 + z * (-1 / 11 + z * (1 / 13 + z * (-1 / 15))))))))
  );
}
