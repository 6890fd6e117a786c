import { describe, expect, it } from 'vitest';
import { fitOls } from './ols';
import { fitPooledOls, lineForGroup } from './pooled-ols';

describe('fitPooledOls', () => {
	it('matches a plain least-squares fit for a single group', () => {
		// Norris's first six points (NIST StRD) as a convenient non-trivial sample.
		const xs = [0.2, 337.4, 118.2, 884.6, 10.1, 226.5];
		const ys = [0.1, 338.8, 118.1, 888.0, 9.2, 228.1];
		const plain = fitOls(xs, ys);
		const pooled = fitPooledOls([{ xs, ys }]);
		expect(pooled.slope).toBeCloseTo(plain.slope, 12);
		expect(pooled.residualStdDev).toBeCloseTo(plain.residualStdDev, 12);
		expect(pooled.slopeStdErr).toBeCloseTo(plain.slopeStdErr, 12);
		expect(pooled.df).toBe(plain.df);
	});

	it('fits parallel lines by hand-checked sums', () => {
		// By hand: Sxy = 2 + 4, Sxx = 2 + 2 → slope 1.5; residuals ±0.5 in each group → SSE 1;
		// df = 6 points − 2 levels − 1 slope = 3.
		const fit = fitPooledOls([
			{ xs: [0, 1, 2], ys: [0, 1, 2] },
			{ xs: [0, 1, 2], ys: [10, 12, 14] }
		]);
		expect(fit.slope).toBe(1.5);
		expect(fit.sse).toBeCloseTo(1, 14);
		expect(fit.df).toBe(3);
		expect(fit.residualStdDev).toBeCloseTo(Math.sqrt(1 / 3), 14);
		const second = lineForGroup(fit, 1);
		expect(second.anchorX).toBe(1);
		expect(second.anchorY).toBe(12);
		// var(ȳ_g) = s²/n_g, var(b) = s²/Sxx.
		expect(second.anchorVariance).toBeCloseTo(1 / 3 / 3, 14);
		expect(second.slopeVariance).toBeCloseTo(1 / 3 / 4, 14);
	});

	it('lets a one-point group fix its own level without touching the slope', () => {
		const fit = fitPooledOls([
			{ xs: [0, 1, 2, 3], ys: [0, 2, 4, 6] },
			{ xs: [10], ys: [5] }
		]);
		expect(fit.slope).toBe(2);
		expect(fit.df).toBe(5 - 2 - 1);
		expect(lineForGroup(fit, 1).anchorY).toBe(5);
	});

	it('refuses groups without two distinct x', () => {
		expect(() =>
			fitPooledOls([
				{ xs: [1], ys: [1] },
				{ xs: [2, 2], ys: [1, 3] }
			])
		).toThrow(RangeError);
	});
});
