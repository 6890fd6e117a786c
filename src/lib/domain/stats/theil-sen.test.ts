import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fitOls } from './ols';
import { fitPooledTheilSen, fitTheilSen, median } from './theil-sen';

describe('median', () => {
	it('equals the middle of the sorted list', () => {
		fc.assert(
			fc.property(
				fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), { minLength: 1, maxLength: 60 }),
				(values) => {
					const sorted = [...values].sort((a, b) => a - b);
					const m = sorted.length;
					const expected = m % 2 ? sorted[m >> 1] : (sorted[m / 2 - 1] + sorted[m / 2]) / 2;
					expect(median(values)).toBe(expected);
				}
			)
		);
	});
});

describe('fitTheilSen', () => {
	it('recovers an exact line', () => {
		const xs = [1, 2, 4, 7, 11];
		const fit = fitTheilSen(
			xs,
			xs.map((x) => 3 - 0.5 * x)
		);
		expect(fit.slope).toBeCloseTo(-0.5, 14);
		expect(fit.intercept).toBeCloseTo(3, 14);
		expect(fit.pairs).toBe(10);
	});

	it('skips pairs with equal x', () => {
		const fit = fitTheilSen([1, 1, 2], [0, 2, 2]);
		// Pairs with distinct x: slopes 2 and 0; median 1.
		expect(fit.pairs).toBe(2);
		expect(fit.slope).toBe(1);
	});

	it('moves far less than least squares under one wild outlier', () => {
		// Property of the estimators: Theil–Sen's breakdown point is about 29 %, least squares' is 0.
		const sample = fc.record({
			n: fc.integer({ min: 10, max: 40 }),
			slope: fc.double({ min: -5, max: 5, noNaN: true }),
			intercept: fc.double({ min: -100, max: 100, noNaN: true }),
			noise: fc.array(fc.double({ min: -1, max: 1, noNaN: true }), {
				minLength: 40,
				maxLength: 40
			}),
			outlierAt: fc.integer({ min: 0, max: 39 }),
			outlierSize: fc.double({ min: 200, max: 5000, noNaN: true }),
			outlierSign: fc.boolean()
		});
		fc.assert(
			fc.property(sample, (s) => {
				const xs = Array.from({ length: s.n }, (_, i) => i);
				const ys = xs.map((x, i) => s.intercept + s.slope * x + s.noise[i]);
				const spoiled = [...ys];
				const at = s.outlierAt % s.n;
				spoiled[at] += s.outlierSign ? s.outlierSize : -s.outlierSize;
				const tsShift = Math.abs(fitTheilSen(xs, spoiled).slope - fitTheilSen(xs, ys).slope);
				const olsShift = Math.abs(fitOls(xs, spoiled).slope - fitOls(xs, ys).slope);
				// The end points carry least-squares leverage; the middle point none (then both barely
				// move, so a float-noise floor of 1e-9 applies). Otherwise the
				// robust slope moves by less than a tenth of what least squares moves.
				expect(tsShift).toBeLessThanOrEqual(Math.max(0.1 * olsShift, 1e-9));
			})
		);
	});
});

describe('fitPooledTheilSen', () => {
	it('uses pairs within groups only, so level steps between groups do not bias the slope', () => {
		const a = { xs: [0, 1, 2, 3], ys: [10, 12, 14, 16] };
		const b = { xs: [4, 5, 6], ys: [0, 2, 4] };
		const fit = fitPooledTheilSen([a, b]);
		expect(fit.slope).toBe(2);
		expect(fit.intercepts[0]).toBe(10);
		expect(fit.intercepts[1]).toBe(-8);
		expect(fit.pairs).toBe(6 + 3);
	});
});
