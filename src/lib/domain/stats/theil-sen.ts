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

let scratch = new Float64Array(1024);

/**
 * Common Theil–Sen slope for groups that share a slope but not a level: the median of the
 * pairwise slopes taken only within each group (pairs across groups would mix levels).
 * @throws RangeError when no group has two points with distinct x
 */
export function fitPooledTheilSen(groups: readonly GroupData[]): PooledTheilSenFit {
	let total = 0;
	for (const g of groups) total += (g.xs.length * (g.xs.length - 1)) / 2;
	// One scratch buffer reused across calls keeps the engine free of per-van garbage.
	if (scratch.length < total) scratch = new Float64Array(Math.max(total, scratch.length * 2));
	let pairs = 0;
	for (const g of groups) {
		const m = g.xs.length;
		for (let i = 0; i < m; i++) {
			for (let j = i + 1; j < m; j++) {
				const dx = g.xs[j] - g.xs[i];
				if (dx !== 0) scratch[pairs++] = (g.ys[j] - g.ys[i]) / dx;
			}
		}
	}
	if (pairs === 0) throw new RangeError('no two points with distinct x');
	const slope = medianInPlace(scratch, pairs);
	const intercepts = groups.map((g) => {
		const residuals = new Float64Array(g.xs.length);
		for (let i = 0; i < g.xs.length; i++) residuals[i] = g.ys[i] - slope * g.xs[i];
		return medianInPlace(residuals);
	});
	return { slope, intercepts, pairs };
}
