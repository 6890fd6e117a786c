/**
 * Theil–Sen robust line: the slope is the median of the slopes between all pairs of points
 * with distinct x (Theil 1950; Sen 1968), the intercept the median of y − b·x. Breakdown point
 * about 29 %: one wild reading barely moves it. O(n²) pairs, fine for the few hundred points
 * of one van.
 */
import type { GroupData } from './pooled-ols';

/**
 * Median of the first `count` entries of `values` (default all). Reorders `values` in place
 * (Hoare's quickselect, expected O(n)); copy first if the order matters.
 */
export function medianInPlace(values: Float64Array | number[], count = values.length): number {
	if (count === 0) return Number.NaN;
	const upper = selectInPlace(values, count >> 1, count);
	if (count % 2 === 1) return upper;
	// The lower middle is the largest value left of the upper middle after selection.
	let lower = Number.NEGATIVE_INFINITY;
	for (let i = 0; i < count >> 1; i++) if (values[i] > lower) lower = values[i];
	return (lower + upper) / 2;
}

/** Median of a list, leaving it untouched. */
export function median(values: ArrayLike<number>): number {
	return medianInPlace(Float64Array.from(values));
}

function selectInPlace(a: Float64Array | number[], k: number, count: number): number {
	let left = 0;
	let right = count - 1;
	while (left < right) {
		const pivot = a[(left + right) >> 1];
		let i = left;
		let j = right;
		while (i <= j) {
			while (a[i] < pivot) i++;
			while (a[j] > pivot) j--;
			if (i <= j) {
				const tmp = a[i];
				a[i] = a[j];
				a[j] = tmp;
				i++;
				j--;
			}
		}
		if (k <= j) right = j;
		else if (k >= i) left = i;
		else return a[k];
	}
	return a[k];
}

export interface TheilSenFit {
	slope: number;
	intercept: number;
	n: number;
	/** Pairs with distinct x that voted on the slope. */
	pairs: number;
}

/**
 * Theil–Sen line through the points.
 * @throws RangeError when no two points have distinct x
 */
export function fitTheilSen(xs: ArrayLike<number>, ys: ArrayLike<number>): TheilSenFit {
	const fit = fitPooledTheilSen([{ xs, ys }]);
	return { slope: fit.slope, intercept: fit.intercepts[0], n: xs.length, pairs: fit.pairs };
}

export interface PooledTheilSenFit {
	slope: number;
	/** Per group: median of y − b·x (NaN for an empty group). */
	intercepts: number[];
	pairs: number;
}

// Scratch buffers reused across calls keep the engine free of per-van garbage.
let slopeScratch: Float64Array = new Float64Array(1024);
let residualScratch: Float64Array = new Float64Array(256);

/** `buffer` if it holds `size` values, else a new one at least twice as large. */
function withCapacity(buffer: Float64Array, size: number): Float64Array {
	return buffer.length >= size ? buffer : new Float64Array(Math.max(size, buffer.length * 2));
}

/**
 * Common Theil–Sen slope for groups that share a slope but not a level: the median of the
 * pairwise slopes taken only within each group (pairs across groups would mix levels).
 * @throws RangeError when no group has two points with distinct x
 */
export function fitPooledTheilSen(groups: readonly GroupData[]): PooledTheilSenFit {
	let total = 0;
	for (const g of groups) total += (g.xs.length * (g.xs.length - 1)) / 2;
	slopeScratch = withCapacity(slopeScratch, total);
	let pairs = 0;
	for (const g of groups) pairs = collectSlopes(g.xs, g.ys, slopeScratch, pairs);
	if (pairs === 0) throw new RangeError('no two points with distinct x');
	const slope = medianInPlace(slopeScratch, pairs);
	const intercepts = new Array<number>(groups.length);
	for (let k = 0; k < groups.length; k++) intercepts[k] = medianIntercept(groups[k], slope);
	return { slope, intercepts, pairs };
}

/** Writes the slopes of all pairs with distinct x into `out` from `count`; returns the new count. */
function collectSlopes(
	xs: ArrayLike<number>,
	ys: ArrayLike<number>,
	out: Float64Array,
	count: number
): number {
	const m = xs.length;
	for (let i = 0; i < m; i++) {
		const xi = xs[i];
		const yi = ys[i];
		for (let j = i + 1; j < m; j++) {
			const dx = xs[j] - xi;
			if (dx !== 0) out[count++] = (ys[j] - yi) / dx;
		}
	}
	return count;
}

/** Median of y − b·x over one group (NaN when it is empty). */
function medianIntercept(g: GroupData, slope: number): number {
	const m = g.xs.length;
	residualScratch = withCapacity(residualScratch, m);
	for (let i = 0; i < m; i++) residualScratch[i] = g.ys[i] - slope * g.xs[i];
	return medianInPlace(residualScratch, m);
}
