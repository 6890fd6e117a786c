import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fitOls, fitOlsThroughOrigin, intervalAt, inversePrediction, lineFromOls } from './ols';

interface Certified {
	parameters: Record<string, { estimate: number; std_dev: number }>;
	residual_std_dev: number;
	r_squared: number;
	anova: { residual: { df: number; sum_sq: number } };
}

function loadDataset(name: string): { xs: number[]; ys: number[]; certified: Certified } {
	const dir = fileURLToPath(new URL('./nist-strd/', import.meta.url));
	const rows = readFileSync(`${dir}${name}.csv`, 'utf8').trim().split('\n').slice(1);
	const xs = rows.map((row) => Number(row.split(',')[0]));
	const ys = rows.map((row) => Number(row.split(',')[1]));
	const certified = JSON.parse(readFileSync(`${dir}${name}.certified.json`, 'utf8')) as Certified;
	return { xs, ys, certified };
}

const relative = (actual: number, expected: number) => Math.abs(actual / expected - 1);

describe('fitOls on NIST StRD Norris', () => {
	// Source: NIST StRD, Linear Least Squares, dataset Norris — certified values (15 digits).
	const { xs, ys, certified } = loadDataset('norris');
	const fit = fitOls(xs, ys);

	it('reproduces the certified estimates and standard deviations to 1e-9 relative', () => {
		expect(fit.n).toBe(36);
		expect(relative(fit.intercept, certified.parameters.B0.estimate)).toBeLessThan(1e-9);
		expect(relative(fit.slope, certified.parameters.B1.estimate)).toBeLessThan(1e-9);
		expect(relative(fit.interceptStdErr, certified.parameters.B0.std_dev)).toBeLessThan(1e-9);
		expect(relative(fit.slopeStdErr, certified.parameters.B1.std_dev)).toBeLessThan(1e-9);
	});

	it('reproduces the certified residual sd, R² and residual sum of squares to 1e-9 relative', () => {
		expect(relative(fit.residualStdDev, certified.residual_std_dev)).toBeLessThan(1e-9);
		expect(relative(fit.rSquared, certified.r_squared)).toBeLessThan(1e-9);
		expect(relative(fit.sse, certified.anova.residual.sum_sq)).toBeLessThan(1e-9);
		expect(fit.df).toBe(certified.anova.residual.df);
	});

	it('gives the derived 95 % prediction and mean intervals', () => {
		// Source: reference/nist-strd/README.md "Derived check values" (computed from the Norris
		// data with t(0.975, 34) = 2.03224450931772; not certified by NIST).
		const line = lineFromOls(fit);
		const rows = [
			{
				x0: 0,
				y: -0.262323073774029,
				sePred: 0.914914746221295,
				pi: [-2.12165354328, 1.59700739573],
				seMean: 0.232818234301152,
				ci: [-0.735466652102, 0.210820504554]
			},
			{
				x0: 500,
				y: 500.796085936453,
				sePred: 0.897673421630752,
				pi: [498.971794054, 502.620377819],
				seMean: 0.151502175800191,
				ci: [500.488196472, 501.103975401]
			},
			{
				x0: 1000,
				y: 1001.85449494668,
				sePred: 0.931090122551328,
				pi: [999.962292157, 1003.74669774],
				seMean: 0.289938189417292,
				ci: [1001.26526965, 1002.44372024]
			}
		];
		for (const row of rows) {
			const prediction = intervalAt(line, row.x0, 0.95, 'prediction');
			const mean = intervalAt(line, row.x0, 0.95, 'mean');
			expect(relative(prediction.estimate, row.y)).toBeLessThan(1e-9);
			expect(relative(prediction.stdErr, row.sePred)).toBeLessThan(1e-9);
			expect(relative(mean.stdErr, row.seMean)).toBeLessThan(1e-9);
			// The interval ends are printed to 12 significant digits.
			expect(prediction.lower).toBeCloseTo(row.pi[0], 8);
			expect(prediction.upper).toBeCloseTo(row.pi[1], 8);
			expect(mean.lower).toBeCloseTo(row.ci[0], 8);
			expect(mean.upper).toBeCloseTo(row.ci[1], 8);
		}
	});

	it('inverts the prediction band: the ends of the x interval sit on the band', () => {
		// Consistency with the derived interval above: at x0 = 500 the upper 95 % prediction
		// bound is 502.620377819, so the calibration interval for y0 = 502.620377819 starts at 500.
		const line = lineFromOls(fit);
		const inverse = inversePrediction(line, 502.620377819, 0.95, 'prediction');
		expect(inverse.bounded).toBe(true);
		expect(inverse.lower as number).toBeCloseTo(500, 6);
		expect(inverse.estimate as number).toBeCloseTo((502.620377819 - fit.intercept) / fit.slope, 9);
	});
});

describe('fitOlsThroughOrigin on NIST StRD NoInt1 and NoInt2', () => {
	for (const name of ['noint1', 'noint2']) {
		it(`reproduces the certified ${name} values to 1e-9 relative`, () => {
			// Source: NIST StRD, Linear Least Squares, datasets NoInt1 / NoInt2 — certified values;
			// R² is the uncentred one NIST certifies for a line through the origin.
			const { xs, ys, certified } = loadDataset(name);
			const fit = fitOlsThroughOrigin(xs, ys);
			expect(relative(fit.slope, certified.parameters.B1.estimate)).toBeLessThan(1e-9);
			expect(relative(fit.slopeStdErr, certified.parameters.B1.std_dev)).toBeLessThan(1e-9);
			expect(relative(fit.residualStdDev, certified.residual_std_dev)).toBeLessThan(1e-9);
			expect(relative(fit.rSquared, certified.r_squared)).toBeLessThan(1e-9);
			expect(relative(fit.sse, certified.anova.residual.sum_sq)).toBeLessThan(1e-9);
		});
	}
});

describe('fitOls properties', () => {
	const points = fc
		.array(
			fc.record({
				x: fc.double({ min: -1000, max: 1000, noNaN: true }),
				y: fc.double({ min: -1000, max: 1000, noNaN: true })
			}),
			{ minLength: 3, maxLength: 40 }
		)
		.filter((ps) => new Set(ps.map((p) => p.x)).size >= 2 && spread(ps.map((p) => p.x)) > 1e-3);

	it('keeps the slope when a reading lying on the least-squares line is added', () => {
		// Property of least squares: a point on the fitted line has zero residual, so the normal
		// equations (Σr = 0, Σr·x = 0) still hold with it added.
		fc.assert(
			fc.property(points, fc.double({ min: -2000, max: 2000, noNaN: true }), (ps, x0) => {
				const xs = ps.map((p) => p.x);
				const ys = ps.map((p) => p.y);
				const before = fitOls(xs, ys);
				const after = fitOls([...xs, x0], [...ys, before.intercept + before.slope * x0]);
				const scale = Math.max(1, Math.abs(before.slope));
				expect(Math.abs(after.slope - before.slope) / scale).toBeLessThan(1e-9);
			})
		);
	});

	it('is unchanged in slope by shifting x by a large offset (centred sums)', () => {
		fc.assert(
			fc.property(points, (ps) => {
				const xs = ps.map((p) => p.x);
				const ys = ps.map((p) => p.y);
				const a = fitOls(xs, ys);
				const b = fitOls(
					xs.map((x) => x + 1e6),
					ys
				);
				const scale = Math.max(1, Math.abs(a.slope));
				expect(Math.abs(a.slope - b.slope) / scale).toBeLessThan(1e-6);
			})
		);
	});

	it('refuses fewer than two points or a single x value', () => {
		expect(() => fitOls([1], [2])).toThrow(RangeError);
		expect(() => fitOls([3, 3, 3], [1, 2, 3])).toThrow(RangeError);
	});
});

function spread(values: number[]): number {
	return Math.max(...values) - Math.min(...values);
}
