/**
 * Running statistics over a stream of values in constant memory: count, mean, variance
 * (Welford's online algorithm), min and max. Two accumulators merge exactly (Chan et al.),
 * which lets buckets of a decimation pyramid combine into phase statistics.
 */

/** Mutable accumulator; `m2` is the sum of squared deviations from the mean. */
export interface RunningStats {
	count: number;
	mean: number;
	m2: number;
	min: number;
	max: number;
}

/** An accumulator holding no values (min +∞, max −∞ so the first value replaces them). */
export function emptyStats(): RunningStats {
	return { count: 0, mean: 0, m2: 0, min: Infinity, max: -Infinity };
}

/**
 * Adds one value in place. Welford (1962), "Note on a method for calculating corrected sums
 * of squares and products", Technometrics 4(3): stable where the naive Σx² − n·x̄² cancels.
 */
export function addValue(stats: RunningStats, value: number): void {
	stats.count += 1;
	const delta = value - stats.mean;
	stats.mean += delta / stats.count;
	stats.m2 += delta * (value - stats.mean);
	if (value < stats.min) stats.min = value;
	if (value > stats.max) stats.max = value;
}

/**
 * Combines two accumulators into a new one, as if every value had been added to one.
 * Chan, Golub & LeVeque (1979) pairwise update: m2 = m2a + m2b + δ²·na·nb / n.
 */
export function mergeStats(a: RunningStats, b: RunningStats): RunningStats {
	if (a.count === 0) return { ...b };
	if (b.count === 0) return { ...a };
	const count = a.count + b.count;
	const delta = b.mean - a.mean;
	return {
		count,
		mean: a.mean + (delta * b.count) / count,
		m2: a.m2 + b.m2 + (delta * delta * a.count * b.count) / count,
		min: Math.min(a.min, b.min),
		max: Math.max(a.max, b.max)
	};
}

/** Population variance (divides by n): the spread of the captured signal itself. */
export function varianceOf(stats: RunningStats): number {
	return stats.count > 0 ? stats.m2 / stats.count : NaN;
}

/** Population standard deviation, in the values' own unit. NaN when empty. */
export function stdDevOf(stats: RunningStats): number {
	return Math.sqrt(varianceOf(stats));
}
