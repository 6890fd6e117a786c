/**
 * Min/max decimation: a million-sample trace is drawn as a few hundred buckets, each keeping
 * the lowest and highest value inside it, so pulses and spikes stay visible at any zoom.
 */
import { addValue, emptyStats, stdDevOf, type RunningStats } from './running-stats';

/** One bucket of a decimated trace; values are in the samples' unit (V for a capture). */
export interface DecimatedBucket {
	/** Time span the bucket covers, s. */
	startS: number;
	endS: number;
	count: number;
	min: number;
	max: number;
	mean: number;
	/** Population standard deviation of the values inside the bucket. */
	stdDev: number;
}

/** Turns an accumulator into a bucket; the caller guarantees count > 0. */
export function toBucket(startS: number, endS: number, stats: RunningStats): DecimatedBucket {
	return {
		startS,
		endS,
		count: stats.count,
		min: stats.min,
		max: stats.max,
		mean: stats.mean,
		stdDev: stdDevOf(stats)
	};
}

/** Throws a RangeError for a reversed range or a target that is not a positive integer. */
export function assertDecimationRequest(t0S: number, t1S: number, targetPoints: number): void {
	if (!Number.isFinite(t0S) || !Number.isFinite(t1S) || t1S < t0S) {
		throw new RangeError(`Time range must run forwards, got ${t0S} s to ${t1S} s`);
	}
	if (!Number.isInteger(targetPoints) || targetPoints < 1) {
		throw new RangeError(`Target point count must be a positive integer, got ${targetPoints}`);
	}
}

/** Index of the first time ≥ t in ascending `timesS` (binary search). */
export function lowerBound(timesS: ArrayLike<number>, t: number): number {
	let lo = 0;
	let hi = timesS.length;
	while (lo < hi) {
		const mid = (lo + hi) >>> 1;
		if (timesS[mid] < t) lo = mid + 1;
		else hi = mid;
	}
	return lo;
}

/**
 * Decimates samples held in memory into `targetPoints` equal time buckets over [t0S, t1S]
 * (both ends included). Every sample in the range lands in exactly one bucket, so the true
 * min and max of the range are always kept. Empty buckets (gaps) are left out.
 * @param timesS sample times, s, ascending
 * @param values sample values, same length
 */
export function decimateMinMax(
	timesS: ArrayLike<number>,
	values: ArrayLike<number>,
	t0S: number,
	t1S: number,
	targetPoints: number
): DecimatedBucket[] {
	assertDecimationRequest(t0S, t1S, targetPoints);
	if (timesS.length !== values.length) {
		throw new RangeError('Times and values must have the same length');
	}
	const widthS = (t1S - t0S) / targetPoints;
	const buckets: DecimatedBucket[] = [];
	let current = emptyStats();
	let currentIndex = -1;
	const flush = (): void => {
		if (current.count === 0) return;
		const startS = t0S + currentIndex * widthS;
		const endS = currentIndex === targetPoints - 1 ? t1S : startS + widthS;
		buckets.push(toBucket(startS, endS, current));
	};
	for (let i = lowerBound(timesS, t0S); i < timesS.length && timesS[i] <= t1S; i++) {
		const index =
			widthS > 0 ? Math.min(targetPoints - 1, Math.floor((timesS[i] - t0S) / widthS)) : 0;
		if (index !== currentIndex) {
			flush();
			current = emptyStats();
			currentIndex = index;
		}
		addValue(current, values[i]);
	}
	flush();
	return buckets;
}
