import fc from 'fast-check';
import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { normalQuantile, studentTCdf, studentTQuantile } from './student-t';

describe('studentTQuantile', () => {
	// Source: NIST/SEMATECH e-Handbook of Statistical Methods, 1.3.6.7.2 "Critical Values of the
	// Student's t Distribution", column α = 0.025 (3 decimals), as carried in reference/student-t.md.
	const nistTable: [number, number][] = [
		[1, 12.706],
		[2, 4.303],
		[3, 3.182],
		[5, 2.571],
		[10, 2.228],
		[20, 2.086],
		[30, 2.042],
		[60, 2.0],
		[100, 1.984]
	];
	it.each(nistTable)('matches the NIST table at df = %i to 3 decimals', (df, value) => {
		expect(Math.abs(studentTQuantile(0.975, df) - value)).toBeLessThanOrEqual(0.0005);
	});

	it('matches the NIST table row for infinite df (1.960) at very large df', () => {
		// Source: NIST/SEMATECH e-Handbook 1.3.6.7.2, row ∞.
		expect(Math.abs(studentTQuantile(0.975, 1e9) - 1.96)).toBeLessThanOrEqual(0.0005);
	});

	// Source: reference/student-t.md, exact column (mpmath, 40 digits; checked against scipy and
	// the closed forms for df = 1 and 2). df = 120 is from other published tables (1.980).
	const exact: [number, number][] = [
		[1, 12.7062047361747],
		[2, 4.30265272974946],
		[3, 3.18244630528371],
		[5, 2.57058183563632],
		[10, 2.22813885198627],
		[20, 2.08596344726586],
		[30, 2.04227245630124],
		[34, 2.03224450931772],
		[60, 2.00029782201426],
		[100, 1.98397151852355],
		[120, 1.97993040508244]
	];
	it.each(exact)('matches the 15-digit value at df = %i to 1e-12 relative', (df, value) => {
		expect(Math.abs(studentTQuantile(0.975, df) / value - 1)).toBeLessThan(1e-12);
	});

	it('agrees with jStat over a grid of df and p to 1e-7 relative', () => {
		// Source: jstat 1.9.6 (npm), good to about 7–8 significant digits for the inverse t
		// (reference/student-t.md), hence the 1e-7 tolerance.
		const dfs = [1, 2, 3, 4, 5, 6, 8, 10, 15, 20, 29, 34, 50, 75, 100, 200, 500, 1000];
		const ps = [
			0.001, 0.005, 0.01, 0.025, 0.05, 0.1, 0.2, 0.3, 0.45, 0.55, 0.7, 0.8, 0.9, 0.95, 0.975, 0.99,
			0.995, 0.999
		];
		for (const df of dfs) {
			for (const p of ps) {
				const ours = studentTQuantile(p, df);
				const theirs = jStat.studentt.inv(p, df);
				expect(Math.abs(ours - theirs) / Math.abs(theirs), `df=${df} p=${p}`).toBeLessThan(1e-7);
			}
		}
	});

	it('is the inverse of its own CDF', () => {
		for (const df of [1, 3, 7.5, 34, 250]) {
			for (const p of [1e-6, 0.01, 0.3, 0.5, 0.9, 0.999999]) {
				const t = studentTQuantile(p, df);
				const tail = Math.min(p, 1 - p);
				expect(Math.abs(studentTCdf(t, df) - p) / tail).toBeLessThan(1e-10);
			}
		}
	});

	it('is antisymmetric about p = 0.5', () => {
		for (const df of [1, 2, 4, 40]) {
			expect(studentTQuantile(0.1, df)).toBeCloseTo(-studentTQuantile(0.9, df), 12);
		}
	});
});

describe('studentTCdf', () => {
	it('agrees with jStat to 1e-7', () => {
		// Source: jstat 1.9.6 (npm) studentt.cdf; its own CDF is good to a few 1e-8 (it is off by 8e-10 even at df = 1, see below).
		for (const df of [1, 2, 5, 30, 120]) {
			for (const t of [-4, -1.5, -0.2, 0, 0.7, 2, 6]) {
				expect(Math.abs(studentTCdf(t, df) - jStat.studentt.cdf(t, df))).toBeLessThan(1e-7);
			}
		}
	});

	it('matches the closed forms for df = 1 (Cauchy) and df = 2', () => {
		// Source: standard closed forms, e.g. Abramowitz & Stegun 26.7.3 / 26.7.4:
		// df = 1: ½ + atan(t)/π; df = 2: ½ + t / (2√(2 + t²)).
		for (const t of [-30, -4, -0.2, 0, 0.7, 3, 100]) {
			expect(studentTCdf(t, 1)).toBeCloseTo(0.5 + Math.atan(t) / Math.PI, 14);
			expect(studentTCdf(t, 2)).toBeCloseTo(0.5 + t / (2 * Math.sqrt(2 + t * t)), 14);
		}
	});
});

describe('normalQuantile', () => {
	it('matches the NIST table row for infinite df and the 15-digit normal quantile', () => {
		// Source: reference/student-t.md, ∞ row: 1.95996398454005 (normal quantile).
		expect(Math.abs(normalQuantile(0.975) / 1.95996398454005 - 1)).toBeLessThan(1e-13);
		expect(normalQuantile(0.5)).toBe(0);
		expect(normalQuantile(0.025)).toBeCloseTo(-normalQuantile(0.975), 14);
	});
});

describe('studentTQuantile memo', () => {
	it('gives the same value however often and in whatever order it is asked', () => {
		fc.assert(
			fc.property(
				fc.array(
					fc.record({
						p: fc.double({ min: 0.001, max: 0.999, noNaN: true }),
						df: fc.integer({ min: 1, max: 5000 })
					}),
					{ minLength: 1, maxLength: 30 }
				),
				(queries) => {
					const first = queries.map((q) => studentTQuantile(q.p, q.df));
					const again = [...queries].reverse().map((q) => studentTQuantile(q.p, q.df));
					expect(again.reverse()).toEqual(first);
					for (let i = 0; i < queries.length; i++) {
						// Still the quantile: the CDF at it gives back p.
						expect(studentTCdf(first[i], queries[i].df)).toBeCloseTo(queries[i].p, 9);
					}
				}
			)
		);
	});
});
