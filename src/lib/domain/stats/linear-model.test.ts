import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { fitLinearModel } from './linear-model';

function load(name: string) {
	const dir = fileURLToPath(new URL('./nist-strd/', import.meta.url));
	const rows = readFileSync(`${dir}${name}.csv`, 'utf8').trim().split('\n').slice(1);
	const certified = JSON.parse(readFileSync(`${dir}${name}.certified.json`, 'utf8'));
	return {
		xs: rows.map((r) => Number(r.split(',')[0])),
		ys: rows.map((r) => Number(r.split(',')[1])),
		certified
	};
}
const relative = (actual: number, expected: number) => Math.abs(actual / expected - 1);

describe('fitLinearModel', () => {
	it('reproduces NIST StRD Norris with an intercept column', () => {
		// Source: NIST StRD, Linear Least Squares, Norris — certified values.
		const { xs, ys, certified } = load('norris');
		const fit = fitLinearModel(
			xs.flatMap((x) => [1, x]),
			ys,
			2
		);
		const s2 = fit.residualStdDev ** 2;
		expect(relative(fit.coefficients[0], certified.parameters.B0.estimate)).toBeLessThan(1e-9);
		expect(relative(fit.coefficients[1], certified.parameters.B1.estimate)).toBeLessThan(1e-9);
		expect(
			relative(Math.sqrt(s2 * fit.unscaledCovariance[0]), certified.parameters.B0.std_dev)
		).toBeLessThan(1e-9);
		expect(
			relative(Math.sqrt(s2 * fit.unscaledCovariance[3]), certified.parameters.B1.std_dev)
		).toBeLessThan(1e-9);
		expect(relative(fit.residualStdDev, certified.residual_std_dev)).toBeLessThan(1e-9);
		expect(fit.df).toBe(34);
	});

	it('reproduces NIST StRD NoInt1 without an intercept', () => {
		// Source: NIST StRD, Linear Least Squares, NoInt1 — certified values.
		const { xs, ys, certified } = load('noint1');
		const fit = fitLinearModel(xs, ys, 1);
		expect(relative(fit.coefficients[0], certified.parameters.B1.estimate)).toBeLessThan(1e-9);
		expect(
			relative(
				fit.residualStdDev * Math.sqrt(fit.unscaledCovariance[0]),
				certified.parameters.B1.std_dev
			)
		).toBeLessThan(1e-9);
		expect(relative(fit.sse, certified.anova.residual.sum_sq)).toBeLessThan(1e-9);
	});

	it('refuses linearly dependent columns', () => {
		expect(() => fitLinearModel([1, 2, 1, 2, 1, 2], [1, 2, 3], 2)).toThrow(RangeError);
	});
});
