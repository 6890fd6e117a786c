import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { PulsationMeter } from './pulsation';
import { addValue, emptyStats, mergeStats, stdDevOf, varianceOf } from './running-stats';
import { CaptureSummary, summariseSamples } from './summary';

const values = fc.array(fc.double({ min: -1e3, max: 1e3, noNaN: true }), {
	minLength: 1,
	maxLength: 300
});

function twoPass(xs: number[]) {
	const mean = xs.reduce((a, b) => a + b, 0) / xs.length;
	const variance = xs.reduce((a, x) => a + (x - mean) ** 2, 0) / xs.length;
	return { mean, variance, min: Math.min(...xs), max: Math.max(...xs) };
}

describe('running statistics', () => {
	it('match the two-pass textbook mean and population variance', () => {
		fc.assert(
			fc.property(values, (xs) => {
				const stats = emptyStats();
				for (const x of xs) addValue(stats, x);
				const truth = twoPass(xs);
				expect(stats.count).toBe(xs.length);
				expect(stats.mean).toBeCloseTo(truth.mean, 8);
				expect(varianceOf(stats)).toBeCloseTo(truth.variance, 6);
				expect(stats.min).toBe(truth.min);
				expect(stats.max).toBe(truth.max);
			})
		);
	});

	it('merge as if every value had been added to one accumulator', () => {
		fc.assert(
			fc.property(values, values, (xs, ys) => {
				const a = emptyStats();
				const b = emptyStats();
				const all = emptyStats();
				for (const x of xs) addValue(a, x);
				for (const y of ys) addValue(b, y);
				for (const v of [...xs, ...ys]) addValue(all, v);
				const merged = mergeStats(a, b);
				expect(merged.count).toBe(all.count);
				expect(merged.mean).toBeCloseTo(all.mean, 8);
				expect(merged.m2).toBeCloseTo(all.m2, 3);
				expect(merged.min).toBe(all.min);
				expect(merged.max).toBe(all.max);
			})
		);
	});

	it('stay accurate on a large offset where the naive formula cancels', () => {
		// Welford (1962): values 1e9 + {4, 7, 13, 16} have variance 22.5 exactly
		const stats = emptyStats();
		for (const x of [4, 7, 13, 16]) addValue(stats, 1e9 + x);
		expect(varianceOf(stats)).toBeCloseTo(22.5, 6);
	});

	it('report NaN spread when empty', () => {
		expect(stdDevOf(emptyStats())).toBeNaN();
	});
});

describe('PulsationMeter', () => {
	it('measures p95 − p5 of a sinusoid as 2·A·sin(0.45π)', () => {
		// Quantiles of A·sin(θ), θ uniform: q-th quantile is A·sin(π(q − ½)); p95 − p5 = 2A·sin(0.45π)
		const meter = new PulsationMeter();
		const amplitudeVolts = 0.05;
		for (let i = 0; i < 20_000; i++) {
			const t = i / 2000;
			meter.add(t, 1.2 + amplitudeVolts * Math.sin(2 * Math.PI * 27 * t));
		}
		expect(meter.amplitudeVolts()).toBeCloseTo(2 * amplitudeVolts * Math.sin(0.45 * Math.PI), 2);
	});

	it('ignores a slow drift of the mean', () => {
		const meter = new PulsationMeter();
		// 0.02 V/s drift: the local mean lags by slope × τ = 2 mV, one or two histogram bins
		for (let i = 0; i < 20_000; i++) meter.add(i / 2000, 0.5 + 0.02 * (i / 2000));
		expect(meter.amplitudeVolts()).toBeLessThanOrEqual(0.002);
	});

	it('is empty until fed', () => {
		expect(new PulsationMeter().amplitudeVolts()).toBeNaN();
	});
});

describe('CaptureSummary', () => {
	it('gives each phase the statistics of its own samples', () => {
		fc.assert(
			fc.property(values, fc.integer({ min: 0, max: 300 }), (vs, cut) => {
				const timesS = vs.map((_, i) => i * 0.01);
				const split = Math.min(cut, vs.length) * 0.01;
				const result = summariseSamples(timesS, vs, {
					phases: { idle: { startS: -1, endS: split }, throttle: { startS: split, endS: 1e9 } }
				});
				const idle = vs.filter((_, i) => timesS[i] < split);
				const throttle = vs.filter((_, i) => timesS[i] >= split);
				for (const [phase, xs] of [
					['idle', idle],
					['throttle', throttle]
				] as const) {
					const s = result.phases[phase];
					if (xs.length === 0) {
						expect(s).toBeUndefined();
						continue;
					}
					const truth = twoPass(xs);
					expect(s?.count).toBe(xs.length);
					expect(s?.meanVolts).toBeCloseTo(truth.mean, 8);
					expect(s?.stdDevVolts).toBeCloseTo(Math.sqrt(truth.variance), 6);
					expect(s?.minVolts).toBe(truth.min);
					expect(s?.maxVolts).toBe(truth.max);
				}
				expect(result.overall?.count).toBe(vs.length);
			})
		);
	});

	it('feeds the pyramid when asked for chart data', () => {
		const summary = new CaptureSummary();
		for (let i = 0; i < 1000; i++) summary.add(i * 0.001, i % 10);
		expect(summary.pyramid?.sampleCount).toBe(1000);
		expect(summary.result().phases).toEqual({});
		expect(summary.result().overall?.maxVolts).toBe(9);
	});

	it('rejects a phase that ends before it starts', () => {
		expect(() => new CaptureSummary({ phases: { idle: { startS: 5, endS: 5 } } })).toThrow(/idle/);
	});
});
