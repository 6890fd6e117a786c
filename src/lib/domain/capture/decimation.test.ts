import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { decimateMinMax, type DecimatedBucket } from './decimation';
import { MinMaxPyramid } from './pyramid';

/** Sorted sample times with values; times may repeat (the parser allows equal timestamps). */
const samples = fc
	.array(
		fc.record({
			dt: fc.oneof(fc.constant(0), fc.double({ min: 1e-4, max: 0.5, noNaN: true })),
			value: fc.double({ min: -10, max: 10, noNaN: true })
		}),
		{ minLength: 1, maxLength: 400 }
	)
	.map((rows) => {
		const timesS: number[] = [];
		const values: number[] = [];
		let t = 0;
		for (const row of rows) {
			t += row.dt;
			timesS.push(t);
			values.push(row.value);
		}
		return { timesS, values };
	});

/** A range inside (or around) the samples' span, as fractions turned into times. */
const rangeOf = (timesS: number[], a: number, b: number): [number, number] => {
	const span = timesS[timesS.length - 1] - timesS[0];
	const t0 = timesS[0] - 0.1 + Math.min(a, b) * (span + 0.2);
	const t1 = timesS[0] - 0.1 + Math.max(a, b) * (span + 0.2);
	return [t0, t1];
};

function trueExtremes(timesS: number[], values: number[], t0: number, t1: number) {
	let min = Infinity;
	let max = -Infinity;
	let count = 0;
	for (let i = 0; i < timesS.length; i++) {
		if (timesS[i] >= t0 && timesS[i] <= t1) {
			min = Math.min(min, values[i]);
			max = Math.max(max, values[i]);
			count++;
		}
	}
	return { min, max, count };
}

const envelope = (buckets: DecimatedBucket[]) => ({
	min: Math.min(...buckets.map((b) => b.min)),
	max: Math.max(...buckets.map((b) => b.max)),
	count: buckets.reduce((n, b) => n + b.count, 0)
});

describe('decimateMinMax', () => {
	it('keeps the exact min and max of every range and every sample once', () => {
		fc.assert(
			fc.property(
				samples,
				fc.double({ min: 0, max: 1, noNaN: true }),
				fc.double({ min: 0, max: 1, noNaN: true }),
				fc.integer({ min: 1, max: 50 }),
				({ timesS, values }, a, b, points) => {
					const [t0, t1] = rangeOf(timesS, a, b);
					const truth = trueExtremes(timesS, values, t0, t1);
					const buckets = decimateMinMax(timesS, values, t0, t1, points);
					expect(buckets.length).toBeLessThanOrEqual(points);
					if (truth.count === 0) {
						expect(buckets).toEqual([]);
						return;
					}
					expect(envelope(buckets)).toEqual(truth);
				}
			)
		);
	});

	it('puts each sample in the bucket covering its time', () => {
		const timesS = [0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10];
		const values = [5, 1, 9, 2, 2, 2, 8, 0, 3, 3, 7];
		const buckets = decimateMinMax(timesS, values, 0, 10, 2);
		// Buckets [0, 5) and [5, 10], the last including its end
		expect(buckets.map((b) => [b.startS, b.endS, b.count, b.min, b.max])).toEqual([
			[0, 5, 5, 1, 9],
			[5, 10, 6, 0, 8]
		]);
		expect(buckets[0].mean).toBeCloseTo(19 / 5, 12);
	});

	it('leaves gaps out', () => {
		const buckets = decimateMinMax([0, 0.1, 9.9, 10], [1, 2, 3, 4], 0, 10, 10);
		expect(buckets.map((b) => b.startS)).toEqual([0, 9]);
	});

	it('rejects a reversed range and a bad point count', () => {
		expect(() => decimateMinMax([0], [0], 2, 1, 10)).toThrow(RangeError);
		expect(() => decimateMinMax([0], [0], 0, 1, 0)).toThrow(RangeError);
		expect(() => decimateMinMax([0], [0], 0, 1, 2.5)).toThrow(RangeError);
	});
});

describe('MinMaxPyramid', () => {
	it('never loses the true min or max of a range', () => {
		fc.assert(
			fc.property(
				samples,
				fc.double({ min: 0, max: 1, noNaN: true }),
				fc.double({ min: 0, max: 1, noNaN: true }),
				fc.integer({ min: 1, max: 40 }),
				fc.constantFrom(4, 8, 16, 64),
				({ timesS, values }, a, b, points, maxBuckets) => {
					const pyramid = new MinMaxPyramid({ maxBuckets, initialBucketS: 1e-3 });
					timesS.forEach((t, i) => pyramid.add(t, values[i]));
					const [t0, t1] = rangeOf(timesS, a, b);
					const truth = trueExtremes(timesS, values, t0, t1);
					const buckets = pyramid.query(t0, t1, points);
					if (truth.count === 0) return;
					const got = envelope(buckets);
					expect(got.min).toBeLessThanOrEqual(truth.min);
					expect(got.max).toBeGreaterThanOrEqual(truth.max);
					// Extra values may only come from one stored bucket beyond the range ends; the
					// level used is never coarser than the requested width (or the finest level)
					const w = Math.max((t1 - t0) / points, pyramid.bucketWidthS);
					const near = trueExtremes(timesS, values, t0 - w, t1 + w);
					expect(got.min).toBeGreaterThanOrEqual(near.min);
					expect(got.max).toBeLessThanOrEqual(near.max);
				}
			)
		);
	});

	it('answers the whole capture with every sample counted', () => {
		fc.assert(
			fc.property(samples, fc.integer({ min: 1, max: 30 }), ({ timesS, values }, points) => {
				const pyramid = new MinMaxPyramid({ maxBuckets: 16, initialBucketS: 1e-3 });
				timesS.forEach((t, i) => pyramid.add(t, values[i]));
				const buckets = pyramid.query(timesS[0], timesS[timesS.length - 1], points);
				const got = envelope(buckets);
				expect(got.count).toBe(timesS.length);
				expect(got.min).toBe(Math.min(...values));
				expect(got.max).toBe(Math.max(...values));
				expect(pyramid.sampleCount).toBe(timesS.length);
			})
		);
	});

	it('keeps memory fixed by widening its buckets as the capture grows', () => {
		const pyramid = new MinMaxPyramid({ maxBuckets: 1024, initialBucketS: 1e-5 });
		const n = 200_000;
		for (let i = 0; i < n; i++) pyramid.add(i * 1e-4, Math.sin(i / 50));
		// 20 s into at most 1024 buckets: width ≥ 20 / 1024 s, a power-of-two multiple of 10 µs
		expect(pyramid.bucketWidthS).toBeGreaterThanOrEqual(20 / 1024);
		expect(pyramid.bucketWidthS).toBeLessThan((2 * 20) / 1024);
		expect(Math.log2(pyramid.bucketWidthS / 1e-5) % 1).toBeCloseTo(0, 9);
		expect(pyramid.query(0, 20, 1e6).length).toBeLessThanOrEqual(1024);
	});

	it('returns about the requested number of buckets from the coarser levels', () => {
		const pyramid = new MinMaxPyramid({ maxBuckets: 4096, initialBucketS: 1e-3 });
		for (let i = 0; i < 40_000; i++) pyramid.add(i * 1e-3, i % 7);
		const buckets = pyramid.query(0, 40, 100);
		expect(buckets.length).toBeLessThanOrEqual(100);
		expect(buckets.length).toBeGreaterThanOrEqual(50);
		expect(envelope(buckets)).toEqual({ min: 0, max: 6, count: 40_000 });
	});

	it('zooms into a short range at the finest stored resolution', () => {
		const pyramid = new MinMaxPyramid({ maxBuckets: 4096, initialBucketS: 1e-3 });
		for (let i = 0; i < 40_000; i++) pyramid.add(i * 1e-3, i === 12_345 ? 99 : 0);
		const w = pyramid.bucketWidthS;
		const buckets = pyramid.query(12.3, 12.4, 1000);
		// Finer than asked is impossible: one bucket per stored bucket in range
		expect(buckets.length).toBe(Math.floor(12.4 / w) - Math.floor(12.3 / w) + 1);
		expect(Math.max(...buckets.map((b) => b.max))).toBe(99);
	});

	it('gives exact statistics for a bucket-aligned range', () => {
		const pyramid = new MinMaxPyramid({ maxBuckets: 64, initialBucketS: 0.5 });
		const values = [1, 2, 3, 4, 5, 6, 7, 8];
		values.forEach((v, i) => pyramid.add(i * 0.25, v));
		// Buckets of 0.5 s: [0, 0.5) holds 1, 2; [0.5, 1) holds 3, 4
		const stats = pyramid.rangeStats(0, 0.99);
		expect(stats.count).toBe(4);
		expect(stats.mean).toBeCloseTo(2.5, 12);
		expect(stats.m2 / stats.count).toBeCloseTo(1.25, 12);
	});

	it('starts empty and rejects bad options', () => {
		expect(new MinMaxPyramid().query(0, 1, 10)).toEqual([]);
		expect(() => new MinMaxPyramid({ maxBuckets: 7 })).toThrow(RangeError);
		expect(() => new MinMaxPyramid({ initialBucketS: 0 })).toThrow(RangeError);
	});
});
