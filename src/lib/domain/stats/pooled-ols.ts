/**
 * Least squares with one common slope and a separate intercept per group (the "parallel lines"
 * model of analysis of covariance). Used for soot growth: every regeneration cycle has its own
 * starting level, but soot loads at the same rate in each.
 * Slope b = Σ_g Σ(x − x̄_g)(y − ȳ_g) / Σ_g Σ(x − x̄_g)²; residual df = N − G − 1
 * (e.g. Draper & Smith, Applied Regression Analysis, ch. 14 on dummy variables).
 */
import type { LineWithError } from './ols';

export interface GroupData {
	xs: ArrayLike<number>;
	ys: ArrayLike<number>;
}

export interface PooledFit {
	slope: number;
	slopeStdErr: number;
	/** √(SSE / df); NaN when df < 1. */
	residualStdDev: number;
	/** N − G − 1. */
	df: number;
	/** All points. */
	n: number;
	/** Pooled within-group Σ(x − x̄_g)². */
	sxx: number;
	sse: number;
	groups: { n: number; xMean: number; yMean: number }[];
}

/**
 * Fits parallel lines to groups of points. Groups of one point are allowed: they fix their own
 * level and add nothing to the slope.
 * @throws RangeError when no group has two distinct x values
 */
export function fitPooledOls(groups: readonly GroupData[]): PooledFit {
	const summaries: { n: number; xMean: number; yMean: number }[] = [];
	let sxx = 0;
	let sxy = 0;
	let n = 0;
	for (const g of groups) {
		const m = g.xs.length;
		let sumX = 0;
		let sumY = 0;
		for (let i = 0; i < m; i++) {
			sumX += g.xs[i];
			sumY += g.ys[i];
		}
		const xMean = m > 0 ? sumX / m : 0;
		const yMean = m > 0 ? sumY / m : 0;
		for (let i = 0; i < m; i++) {
			const dx = g.xs[i] - xMean;
			sxx += dx * dx;
			sxy += dx * (g.ys[i] - yMean);
		}
		summaries.push({ n: m, xMean, yMean });
		n += m;
	}
	if (!(sxx > 0)) throw new RangeError('no group has two distinct x values');
	const slope = sxy / sxx;
	let sse = 0;
	groups.forEach((g, k) => {
		const { xMean, yMean } = summaries[k];
		for (let i = 0; i < g.xs.length; i++) {
			const r = g.ys[i] - yMean - slope * (g.xs[i] - xMean);
			sse += r * r;
		}
	});
	const nonEmpty = summaries.filter((s) => s.n > 0).length;
	const df = n - nonEmpty - 1;
	const residualStdDev = df > 0 ? Math.sqrt(sse / df) : Number.NaN;
	return {
		slope,
		slopeStdErr: residualStdDev / Math.sqrt(sxx),
		residualStdDev,
		df,
		n,
		sxx,
		sse,
		groups: summaries
	};
}

/** The line of one group, in the form the interval helpers in ols.ts take. */
export function lineForGroup(fit: PooledFit, groupIndex: number): LineWithError {
	const g = fit.groups[groupIndex];
	const s2 = fit.residualStdDev * fit.residualStdDev;
	// A group's mean and the within-group slope are uncorrelated (the slope uses deviations only).
	return {
		slope: fit.slope,
		anchorX: g.xMean,
		anchorY: g.yMean,
		anchorVariance: s2 / g.n,
		anchorSlopeCovariance: 0,
		slopeVariance: s2 / fit.sxx,
		residualStdDev: fit.residualStdDev,
		df: fit.df
	};
}
