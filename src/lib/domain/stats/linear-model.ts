/**
 * General linear least squares y = X·β for a handful of columns, by Householder QR
 * (Golub & Van Loan, Matrix Computations, §5.2), which avoids squaring the condition number as
 * the normal equations would. Gives the coefficients, their unscaled covariance (XᵀX)⁻¹ and
 * the residual sum of squares. Checked against NIST StRD Norris and NoInt1 in its test.
 */

export interface LinearModelFit {
	coefficients: Float64Array;
	/** (XᵀX)⁻¹, p×p row-major; multiply by s² for the covariance of the coefficients. */
	unscaledCovariance: Float64Array;
	sse: number;
	n: number;
	p: number;
	/** n − p. */
	df: number;
	/** √(SSE / df); NaN when df < 1. */
	residualStdDev: number;
}

/**
 * @param rows design matrix, n×p row-major
 * @param ys n observations
 * @param p number of columns, 1 ≤ p ≤ n
 * @throws RangeError when the columns are (numerically) linearly dependent
 */
export function fitLinearModel(
	rows: ArrayLike<number>,
	ys: ArrayLike<number>,
	p: number
): LinearModelFit {
	const n = ys.length;
	if (rows.length !== n * p) throw new RangeError('design matrix does not match n × p');
	if (n < p) throw new RangeError('fewer observations than columns');
	// Column-major working copy (a plain array: cheaper to allocate than a small typed array).
	const a = new Array<number>(n * p);
	let scale = 0;
	for (let i = 0; i < n; i++) {
		for (let j = 0; j < p; j++) {
			a[j * n + i] = rows[i * p + j];
			scale = Math.max(scale, Math.abs(rows[i * p + j]));
		}
	}
	const y = Array.from(ys);
	const diag = new Array<number>(p);
	for (let j = 0; j < p; j++) {
		const col = j * n;
		let norm = 0;
		for (let i = j; i < n; i++) norm += a[col + i] * a[col + i];
		norm = Math.sqrt(norm);
		if (!(norm > 1e-12 * scale)) throw new RangeError('columns are linearly dependent');
		const alpha = a[col + j] > 0 ? -norm : norm;
		// v = x − alpha·e1, stored in place; H = I − 2vvᵀ/(vᵀv).
		a[col + j] -= alpha;
		let vv = 0;
		for (let i = j; i < n; i++) vv += a[col + i] * a[col + i];
		for (let k = j + 1; k < p; k++) {
			const other = k * n;
			let dot = 0;
			for (let i = j; i < n; i++) dot += a[col + i] * a[other + i];
			const f = (2 * dot) / vv;
			for (let i = j; i < n; i++) a[other + i] -= f * a[col + i];
		}
		let dotY = 0;
		for (let i = j; i < n; i++) dotY += a[col + i] * y[i];
		const fy = (2 * dotY) / vv;
		for (let i = j; i < n; i++) y[i] -= fy * a[col + i];
		diag[j] = alpha;
	}
	const coefficients = new Float64Array(p);
	for (let j = p - 1; j >= 0; j--) {
		let sum = y[j];
		for (let k = j + 1; k < p; k++) sum -= upper(a, diag, n, j, k) * coefficients[k];
		coefficients[j] = sum / diag[j];
	}
	let sse = 0;
	for (let i = p; i < n; i++) sse += y[i] * y[i];
	// R⁻¹ (upper triangular), then (XᵀX)⁻¹ = R⁻¹R⁻ᵀ.
	const rInv = new Array<number>(p * p).fill(0);
	for (let j = 0; j < p; j++) {
		rInv[j * p + j] = 1 / diag[j];
		for (let i = j - 1; i >= 0; i--) {
			let sum = 0;
			for (let k = i + 1; k <= j; k++) sum += upper(a, diag, n, i, k) * rInv[k * p + j];
			rInv[i * p + j] = -sum / diag[i];
		}
	}
	const unscaledCovariance = new Float64Array(p * p);
	for (let i = 0; i < p; i++) {
		for (let j = 0; j < p; j++) {
			let sum = 0;
			for (let k = Math.max(i, j); k < p; k++) sum += rInv[i * p + k] * rInv[j * p + k];
			unscaledCovariance[i * p + j] = sum;
		}
	}
	const df = n - p;
	return {
		coefficients,
		unscaledCovariance,
		sse,
		n,
		p,
		df,
		residualStdDev: df > 0 ? Math.sqrt(sse / df) : Number.NaN
	};
}

/** R[row][column] of the QR factor: the diagonal in `diag`, above it in a[column·n + row]. */
function upper(a: number[], diag: number[], n: number, row: number, column: number): number {
	return row === column ? diag[row] : a[column * n + row];
}
