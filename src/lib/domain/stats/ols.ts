/**
 * Ordinary least squares for a straight line, with the Student-t intervals the forecast needs.
 * Sums are centred (two passes) so large x offsets such as epoch days do not cancel digits.
 * Checked against the NIST StRD certified values (Norris, NoInt1, NoInt2) in ols.test.ts.
 */
import { studentTQuantile } from './student-t';

export interface OlsFit {
	slope: number;
	intercept: number;
	slopeStdErr: number;
	interceptStdErr: number;
	/** s = √(SSE / (n − 2)). NaN when n = 2. */
	residualStdDev: number;
	rSquared: number;
	n: number;
	/** Residual degrees of freedom, n − 2. */
	df: number;
	xMean: number;
	yMean: number;
	/** Σ(x − x̄)². */
	sxx: number;
	/** Residual sum of squares. */
	sse: number;
}

/**
 * Least-squares line y = intercept + slope·x.
 * Standard errors: se(b) = s/√Sxx, se(a) = s·√(1/n + x̄²/Sxx) (e.g. Draper & Smith,
 * Applied Regression Analysis, ch. 1).
 * @param xs at least 2 values, not all equal
 * @param ys same length as xs
 * @throws RangeError when fewer than 2 points or all x are equal
 */
export function fitOls(xs: ArrayLike<number>, ys: ArrayLike<number>): OlsFit {
	const n = xs.length;
	if (n !== ys.length) throw new RangeError('xs and ys differ in length');
	if (n < 2) throw new RangeError('a line needs at least 2 points');
	let sumX = 0;
	let sumY = 0;
	for (let i = 0; i < n; i++) {
		sumX += xs[i];
		sumY += ys[i];
	}
	const xMean = sumX / n;
	const yMean = sumY / n;
	let sxx = 0;
	let sxy = 0;
	let syy = 0;
	for (let i = 0; i < n; i++) {
		const dx = xs[i] - xMean;
		const dy = ys[i] - yMean;
		sxx += dx * dx;
		sxy += dx * dy;
		syy += dy * dy;
	}
	if (!(sxx > 0)) throw new RangeError('all x values are equal');
	const slope = sxy / sxx;
	const intercept = yMean - slope * xMean;
	// Residuals summed directly rather than as Syy − b·Sxy, which loses digits on a good fit.
	let sse = 0;
	for (let i = 0; i < n; i++) {
		const r = ys[i] - yMean - slope * (xs[i] - xMean);
		sse += r * r;
	}
	const df = n - 2;
	const residualStdDev = df > 0 ? Math.sqrt(sse / df) : Number.NaN;
	return {
		slope,
		intercept,
		slopeStdErr: residualStdDev / Math.sqrt(sxx),
		interceptStdErr: residualStdDev * Math.sqrt(1 / n + (xMean * xMean) / sxx),
		residualStdDev,
		rSquared: syy > 0 ? 1 - sse / syy : 1,
		n,
		df,
		xMean,
		yMean,
		sxx,
		sse
	};
}

export interface OriginFit {
	slope: number;
	slopeStdErr: number;
	/** s = √(SSE / (n − 1)). */
	residualStdDev: number;
	/** Uncentred: 1 − SSE / Σy², the convention for a line through the origin (NIST StRD). */
	rSquared: number;
	n: number;
	df: number;
	sse: number;
}

/**
 * Least-squares line through the origin, y = slope·x: b = Σxy / Σx², se(b) = s / √Σx².
 * @throws RangeError when fewer than 2 points or all x are zero
 */
export function fitOlsThroughOrigin(xs: ArrayLike<number>, ys: ArrayLike<number>): OriginFit {
	const n = xs.length;
	if (n !== ys.length) throw new RangeError('xs and ys differ in length');
	if (n < 2) throw new RangeError('a line needs at least 2 points');
	let sxx = 0;
	let sxy = 0;
	let syy = 0;
	for (let i = 0; i < n; i++) {
		sxx += xs[i] * xs[i];
		sxy += xs[i] * ys[i];
		syy += ys[i] * ys[i];
	}
	if (!(sxx > 0)) throw new RangeError('all x values are zero');
	const slope = sxy / sxx;
	let sse = 0;
	for (let i = 0; i < n; i++) {
		const r = ys[i] - slope * xs[i];
		sse += r * r;
	}
	const df = n - 1;
	const residualStdDev = Math.sqrt(sse / df);
	return {
		slope,
		slopeStdErr: residualStdDev / Math.sqrt(sxx),
		residualStdDev,
		rSquared: 1 - sse / syy,
		n,
		df,
		sse
	};
}

/**
 * A fitted line in the form the interval formulas need: ŷ(x) = anchorY + slope·(x − anchorX),
 * with the covariance of (anchorY, slope). For a plain fit anchored at (x̄, ȳ):
 * var(ȳ) = s²/n, cov = 0, var(b) = s²/Sxx. Other models (parallel lines, a regeneration-anchored
 * fit) fill in their own covariance.
 */
export interface LineWithError {
	slope: number;
	anchorX: number;
	anchorY: number;
	/** var(anchorY), in y units squared. */
	anchorVariance: number;
	/** cov(anchorY, slope). */
	anchorSlopeCovariance: number;
	/** var(slope). */
	slopeVariance: number;
	/** s, the residual standard deviation (for the new-observation term). */
	residualStdDev: number;
	/** Residual degrees of freedom. */
	df: number;
}

/** The interval view of a plain OLS fit. */
export function lineFromOls(fit: OlsFit): LineWithError {
	const s2 = fit.residualStdDev * fit.residualStdDev;
	return {
		slope: fit.slope,
		anchorX: fit.xMean,
		anchorY: fit.yMean,
		anchorVariance: s2 / fit.n,
		anchorSlopeCovariance: 0,
		slopeVariance: s2 / fit.sxx,
		residualStdDev: fit.residualStdDev,
		df: fit.df
	};
}

export interface Interval {
	estimate: number;
	stdErr: number;
	lower: number;
	upper: number;
}

/** var(ŷ(x0)) of the fitted line (no new-observation term). */
function meanVariance(line: LineWithError, x0: number): number {
	const dx = x0 - line.anchorX;
	return line.anchorVariance + 2 * dx * line.anchorSlopeCovariance + dx * dx * line.slopeVariance;
}

/**
 * Two-sided Student-t interval for a new observation at x0 (`kind: 'prediction'`):
 * se = s·√(1 + 1/n + (x0 − x̄)²/Sxx) for a plain fit; or for the mean line at x0
 * (`kind: 'mean'`): the same without the leading 1 (Draper & Smith, Applied Regression
 * Analysis, ch. 1; NIST/SEMATECH e-Handbook 4.5.2).
 * @param level central coverage, 0 < level < 1 (e.g. 0.95)
 */
export function intervalAt(
	line: LineWithError,
	x0: number,
	level: number,
	kind: 'prediction' | 'mean' = 'prediction'
): Interval {
	const newObservation = kind === 'prediction' ? line.residualStdDev * line.residualStdDev : 0;
	const stdErr = Math.sqrt(newObservation + meanVariance(line, x0));
	const estimate = line.anchorY + line.slope * (x0 - line.anchorX);
	const t = studentTQuantile(0.5 + level / 2, line.df);
	return { estimate, stdErr, lower: estimate - t * stdErr, upper: estimate + t * stdErr };
}

export interface InverseInterval {
	/** x at which the line reaches y0; null when the slope is zero. */
	estimate: number | null;
	/** Interval ends; null means unbounded on that side. */
	lower: number | null;
	upper: number | null;
	/** False when the slope is not clearly non-zero at this level: the interval is not finite. */
	bounded: boolean;
}

/**
 * Inverse prediction (calibration): the x at which the line reaches y0, with the set of x
 * where y0 lies inside the Student-t interval at x — the classical calibration interval
 * (Fieller's theorem; Draper & Smith ch. 3 "inverse regression"). With u = x − x_a and
 * d = ŷ(x_a) − y0 it solves
 * (b·u + d)² = t²·(var(ŷ_a) + 2u·cov + u²·var(b) + k·s²), k = 1 (prediction) or 0 (mean).
 * When b² ≤ t²·var(b) the slope is indistinguishable from zero and the set is unbounded.
 * @param level central coverage, 0 < level < 1
 */
export function inversePrediction(
	line: LineWithError,
	y0: number,
	level: number,
	kind: 'prediction' | 'mean' = 'prediction'
): InverseInterval {
	const b = line.slope;
	const d = line.anchorY - y0;
	const estimate = b !== 0 ? line.anchorX - d / b : null;
	const t = studentTQuantile(0.5 + level / 2, line.df);
	const t2 = t * t;
	const k = kind === 'prediction' ? line.residualStdDev * line.residualStdDev : 0;
	const a = b * b - t2 * line.slopeVariance;
	if (!(a > 0) || estimate === null) {
		return { estimate, lower: null, upper: null, bounded: false };
	}
	const half = b * d - t2 * line.anchorSlopeCovariance;
	const c = d * d - t2 * (line.anchorVariance + k);
	// a > 0 and the quadratic is ≤ 0 at the estimate, so its roots are real; guard rounding.
	const root = Math.sqrt(Math.max(0, half * half - a * c));
	// Stable quadratic roots (no cancellation between −half and root).
	const q = -half - Math.sign(half || 1) * root;
	const u1 = q / a;
	const u2 = q !== 0 ? c / q : -u1;
	return {
		estimate,
		lower: line.anchorX + Math.min(u1, u2),
		upper: line.anchorX + Math.max(u1, u2),
		bounded: true
	};
}
