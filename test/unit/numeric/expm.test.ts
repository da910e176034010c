// Matrix exponential against mathjs `expm` (an independent Padé scaling-and-squaring implementation), and
// its refusal of matrices outside double precision.
import fc from 'fast-check';
import * as math from 'mathjs';
import { describe, expect, it } from 'vitest';
import { expm, MAX_SQUARINGS } from '../../../shared/src/numeric/expm';
import { OutOfRangeError } from '../../../shared/src/numeric/rangeError';

const toRows = (a: Float64Array, n: number) =>
  Array.from({ length: n }, (_, i) => Array.from(a.subarray(i * n, i * n + n)));

const entry = fc.double({ min: -3, max: 3, noNaN: true });

describe('expm', () => {
  it('matches mathjs expm on random general matrices (entrywise, relative to the norm)', () => {
    fc.assert(
      fc.property(
        fc
          .integer({ min: 1, max: 6 })
          .chain((n) => fc.tuple(fc.constant(n), fc.array(entry, { minLength: n * n, maxLength: n * n }))),
        fc.double({ min: 0.01, max: 30, noNaN: true }),
        ([n, values], scale) => {
          const a = Float64Array.from(values, (v) => v * scale);
          const ours = expm(a, n);
          // Source of the check values: mathjs expm.
          const ref = math.expm(math.matrix(toRows(a, n))).toArray() as number[][];
          const size = Math.max(...ref.flat().map(Math.abs), 1e-300);
          for (let i = 0; i < n; i++) {
            for (let j = 0; j < n; j++) {
              expect(Math.abs(ours[i * n + j] - ref[i]![j]!)).toBeLessThanOrEqual(1e-9 * size);
            }
          }
        },
      ),
      { numRuns: 200 },
    );
  });

  it('gives the rotation [[cos 1, sin 1], [−sin 1, cos 1]] for [[0, 1], [−1, 0]] (closed form)', () => {
    const e = expm(Float64Array.of(0, 1, -1, 0), 2);
    // e^(Jθ) with J the 90° rotation generator is the rotation by θ (any linear-systems text).
    const expected = [Math.cos(1), Math.sin(1), -Math.sin(1), Math.cos(1)];
    expected.forEach((v, i) => expect(Math.abs(e[i]! - v)).toBeLessThan(1e-14));
  });

  it('refuses an entry near the top of double range instead of squaring without end', () => {
    // Row sums of 1e308 + 1e308 overflow to ∞, which once made the squaring count infinite.
    const a = Float64Array.of(-1e308, 1e308, 0, -1e308);
    expect(() => expm(a, 2)).toThrow(OutOfRangeError);
  });

  it('refuses NaN and ±∞ entries', () => {
    for (const bad of [NaN, Infinity, -Infinity]) {
      expect(() => expm(Float64Array.of(bad, 0, 0, 1), 2)).toThrow(OutOfRangeError);
    }
  });

  it('handles the largest finite norm within the squaring bound', () => {
    // A finite norm is below 2^1024: scaling below 1/2 needs at most 1026 halvings (IEEE 754 range).
    expect(MAX_SQUARINGS).toBeGreaterThanOrEqual(1026);
    // e^(−x) underflows to 0 for x = 1e300 (exp of a 1×1 matrix is the scalar exponential).
    expect(expm(Float64Array.of(-1e300), 1)[0]).toBe(0);
    // e^(+x) for x = 1e300 overflows: refused, not returned as ∞.
    expect(() => expm(Float64Array.of(1e300), 1)).toThrow(OutOfRangeError);
  });
});
