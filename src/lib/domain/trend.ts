/**
 * Trend of one comparable Δp series: where the filter's epoch starts (cleaning, replacement,
 * sensor repair), where regenerations cut it into cycles, how fast Δp grows within a cycle
 * (one common slope for all recent cycles, each cycle at its own level), and the level each
 * completed cycle reached before it regenerated.
 */
import { fitLinearModel, type LinearModelFit } from './stats/linear-model';
import { lineForGroup, fitPooledOls, type GroupData, type PooledFit } from './stats/pooled-ols';
import { regularizedBeta } from './stats/student-t';
import { fitOls, lineFromOls, type LineWithError } from './stats/ols';
import { fitPooledTheilSen, fitTheilSen, medianInPlace } from './stats/theil-sen';
import { sortedByTime, type SeriesPoint } from './series';
import type { EventKind } from './vocabulary';

export const MS_PER_DAY = 86_400_000;

/** A filter or sensor event as the engine sees it. */
export interface FilterEvent {
	at: Date;
	kind: EventKind;
	odometerKm?: number;
}

/** Events that start a new baseline: what came before is not comparable with what follows. */
const EPOCH_EVENTS: readonly EventKind[] = [
	'filter_cleaning',
	'filter_replacement',
	'sensor_repair'
];

export interface TrendOptions {
	/** A fall between consecutive readings larger than this marks a regeneration, mbar (default: 10 % of the concern line). */
	dropThresholdMbar?: number;
	/** Cycles whose last reading is older than this do not enter the growth fit, days (default 365). */
	lookbackDays?: number;
	/** Readings further than this many robust sds from the Theil–Sen lines are left out of least squares (default 4.5). */
	outlierCutoff?: number;
}

export interface Epoch {
	/** When the current baseline began, or null when no resetting event is on record. */
	startAt: Date | null;
	startedBy: EventKind | null;
	/** Points from the epoch start up to `now`, sorted. */
	points: SeriesPoint[];
}

/**
 * The points of the current epoch: after the last cleaning, replacement or sensor repair
 * at or before `now`, and not after `now`.
 */
export function findEpoch(
	points: readonly SeriesPoint[],
	events: readonly FilterEvent[],
	now: Date
): Epoch {
	const nowMs = now.getTime();
	let start: FilterEvent | null = null;
	for (const e of events) {
		if (!EPOCH_EVENTS.includes(e.kind) || e.at.getTime() > nowMs) continue;
		if (start === null || e.at.getTime() > start.at.getTime()) start = e;
	}
	const fromMs = start?.at.getTime() ?? Number.NEGATIVE_INFINITY;
	return {
		startAt: start?.at ?? null,
		startedBy: start?.kind ?? null,
		points: points.filter((p) => p.at.getTime() > fromMs && p.at.getTime() <= nowMs)
	};
}

export type CycleStart = 'epoch_start' | 'reported' | 'detected';

export interface Cycle {
	points: SeriesPoint[];
	startedBy: CycleStart;
	/** The regeneration that began the cycle (reported time, or midway between the readings around a detected drop). */
	startAt: Date | null;
	/** The regeneration that ended it; null for the current cycle. */
	endAt: Date | null;
	/** Interrupted regenerations reported inside the cycle. */
	interruptedCount: number;
}

export interface CycleSplit {
	cycles: Cycle[];
	/** True when the van reports its own active regenerations: then only reports cut cycles. */
	usesReports: boolean;
	reportedCount: number;
	detectedCount: number;
	/** The drop threshold actually used (raised above the configured one on noisy series), mbar. */
	dropThresholdMbar: number;
}

/**
 * Cuts an epoch into regeneration cycles.
 * - Reported active and service regenerations always cut.
 * - If the van reports active regenerations at all in this epoch, nothing else cuts (a drop
 *   without a report is scatter). Otherwise a fall between consecutive readings larger than
 *   the threshold marks an unreported regeneration. The threshold is raised to 3·√2 times the
 *   reading noise (estimated from second differences away from candidate drops) so noise alone
 *   rarely cuts.
 * - Interrupted regenerations never cut: they do not lower Δp.
 */
export function splitIntoCycles(
	epoch: Epoch,
	events: readonly FilterEvent[],
	now: Date,
	dropThresholdMbar: number
): CycleSplit {
	const points = epoch.points;
	const fromMs = epoch.startAt?.getTime() ?? Number.NEGATIVE_INFINITY;
	const nowMs = now.getTime();
	const inEpoch = sortedByTime(
		events.filter((e) => e.at.getTime() > fromMs && e.at.getTime() <= nowMs)
	);
	const regens: FilterEvent[] = [];
	const interrupted: FilterEvent[] = [];
	let usesReports = false;
	for (const e of inEpoch) {
		if (e.kind === 'regen_active' || e.kind === 'regen_service') regens.push(e);
		else if (e.kind === 'regen_interrupted') interrupted.push(e);
		if (e.kind === 'regen_active') usesReports = true;
	}
	const threshold = usesReports
		? Number.POSITIVE_INFINITY
		: Math.max(
				dropThresholdMbar,
				3 * Math.SQRT2 * noiseFromSecondDifferences(points, dropThresholdMbar)
			);

	const cycles: Cycle[] = [];
	// The current cycle's readings are points[first…i); copied out in one slice when it closes.
	let first = 0;
	let current: Cycle = {
		points: [],
		startedBy: 'epoch_start',
		startAt: epoch.startAt,
		endAt: null,
		interruptedCount: 0
	};
	let regenIndex = 0;
	let interruptedIndex = 0;
	let reportedCount = 0;
	let detectedCount = 0;
	for (let i = 0; i < points.length; i++) {
		const p = points[i];
		const pMs = p.at.getTime();
		// Regenerations reported up to this reading: the last of them starts the new cycle.
		let reportedAt: Date | null = null;
		while (regenIndex < regens.length && regens[regenIndex].at.getTime() <= pMs) {
			reportedAt = regens[regenIndex].at;
			regenIndex++;
			reportedCount++;
		}
		const previous = i > 0 ? points[i - 1] : null;
		const dropped = previous !== null && previous.deltaPMbar - p.deltaPMbar > threshold;
		if ((reportedAt !== null || dropped) && i > first) {
			const startAt = reportedAt ?? new Date((pMs + (previous as SeriesPoint).at.getTime()) / 2);
			current.points = points.slice(first, i);
			current.endAt = startAt;
			cycles.push(current);
			first = i;
			current = {
				points: [],
				startedBy: reportedAt !== null ? 'reported' : 'detected',
				startAt,
				endAt: null,
				interruptedCount: 0
			};
			if (reportedAt === null) detectedCount++;
		} else if (reportedAt !== null) {
			// A regeneration before the epoch's first reading: that reading is already post-regeneration.
			current.startedBy = 'reported';
			current.startAt = reportedAt;
		}
		while (
			interruptedIndex < interrupted.length &&
			interrupted[interruptedIndex].at.getTime() <= pMs
		) {
			current.interruptedCount++;
			interruptedIndex++;
		}
	}
	current.points = points.slice(first);
	// Regenerations after the last reading end the current cycle with no reading yet in the new one.
	if (regenIndex < regens.length && current.points.length > 0) {
		const last = regens[regens.length - 1];
		current.endAt = last.at;
		cycles.push(current);
		reportedCount += regens.length - regenIndex;
		current = {
			points: [],
			startedBy: 'reported',
			startAt: last.at,
			endAt: null,
			interruptedCount: 0
		};
		interruptedIndex = interrupted.findIndex((e) => e.at.getTime() > last.at.getTime());
		if (interruptedIndex < 0) interruptedIndex = interrupted.length;
	}
	current.interruptedCount += interrupted.length - interruptedIndex;
	cycles.push(current);
	return {
		cycles,
		usesReports,
		reportedCount,
		detectedCount,
		dropThresholdMbar: threshold
	};
}

/**
 * Reading noise sd from second differences: for a locally straight series with independent
 * noise σ and even spacing, y[i+1] − 2y[i] + y[i−1] has sd σ·√6. Triples holding a fall larger
 * than `dropMbar` (a candidate regeneration) are left out, and the median absolute value
 * (÷ 0.6745 for a normal sd) shrugs off the rest of the saw-tooth.
 */
function noiseFromSecondDifferences(points: readonly SeriesPoint[], dropMbar: number): number {
	if (secondDifferenceScratch.length < points.length) {
		secondDifferenceScratch = new Float64Array(points.length * 2);
	}
	let count = 0;
	for (let i = 1; i < points.length - 1; i++) {
		const a = points[i - 1].deltaPMbar;
		const b = points[i].deltaPMbar;
		const c = points[i + 1].deltaPMbar;
		if (a - b > dropMbar || b - c > dropMbar) continue;
		secondDifferenceScratch[count++] = Math.abs(c - 2 * b + a);
	}
	if (count < 3) return 0;
	return medianInPlace(secondDifferenceScratch, count) / 0.6745 / Math.sqrt(6);
}
let secondDifferenceScratch = new Float64Array(256);

export interface CyclePeak {
	/** When the cycle ended (its regeneration). */
	at: Date;
	/** Fitted Δp just before the regeneration, mbar. */
	peakMbar: number;
	/** Fitted Δp at the start of the cycle, mbar. */
	startMbar: number;
}

export type GrowthModel = 'parallel' | 'anchored';

export interface GrowthFit {
	/**
	 * `parallel`: every cycle at its own level, one common slope. `anchored`: every cycle starts
	 * from a post-regeneration baseline that moves in a straight line (ash), so all readings pin
	 * the current level; used when regenerations are reported and the data do not reject it.
	 */
	model: GrowthModel;
	/** Least-squares growth within cycles after screening, mbar/day. */
	slopeMbarPerDay: number;
	slopeStdErrMbarPerDay: number;
	/** Theil–Sen growth within cycles (all readings), mbar/day. */
	theilSenMbarPerDay: number;
	/** Residual sd around the cycle lines, mbar. */
	residualStdDevMbar: number;
	df: number;
	readingsUsed: number;
	cyclesUsed: number;
	/** Readings left out of least squares as outliers. */
	screenedOut: SeriesPoint[];
	/** The current cycle's line, x in days relative to `now`. */
	currentLine: LineWithError;
	/** Theil–Sen level of the current cycle at `now`, mbar. */
	currentTheilSenMbar: number;
	/** Post-regeneration baseline trend from the anchored model, mbar/day (null for `parallel`). */
	baselineMbarPerDay: number | null;
	/** p-value of the F-test of the anchored model against parallel lines (null when not tried). */
	anchoredPValue: number | null;
	/** Completed cycles in the window, oldest first. */
	peaks: CyclePeak[];
}

/** Significance below which the data reject the anchored model. */
const ANCHOR_REJECT_P = 0.05;

/**
 * Fits soot growth: one slope shared by the current cycle and every earlier cycle of the epoch
 * whose last reading falls within the look-back window.
 * 1. Theil–Sen (pairs within cycles only) screens out wild readings.
 * 2. Parallel lines by least squares: each cycle its own level.
 * 3. Where the current cycle and at least two earlier ones began at a reported regeneration,
 *    the anchored model — level = baseline(start) + growth × time since start, the baseline a
 *    straight line in time — is tried; it replaces the parallel lines unless an F-test rejects
 *    it at 5 % (then regenerations are not resetting to a steady baseline).
 * Returns null when no cycle has two readings at distinct times.
 * @param now x = 0; times become days relative to it
 */
export function fitGrowth(
	cycles: readonly Cycle[],
	now: Date,
	options: { lookbackDays: number; outlierCutoff: number }
): GrowthFit | null {
	const nowMs = now.getTime();
	const fromMs = nowMs - options.lookbackDays * MS_PER_DAY;
	const used = cycles.filter(
		(c, i) =>
			i === cycles.length - 1 ||
			(c.points.length > 0 && c.points[c.points.length - 1].at.getTime() >= fromMs)
	);
	const groups: CycleData[] = used.map((c) => cycleData(c.points, nowMs));
	if (!groups.some(hasDistinctTimes)) return null;

	const robust = fitPooledTheilSen(groups);
	const limit = screeningLimit(groups, robust.slope, robust.intercepts, options.outlierCutoff);
	const screenedOut: SeriesPoint[] = [];
	const kept: CycleData[] = groups.map((g, k) => {
		const fit = { slope: robust.slope, intercept: robust.intercepts[k], limit };
		return keepScreened(g, fit, used[k].points, screenedOut);
	});
	let parallel: PooledFit;
	try {
		parallel = fitPooledOls(kept);
	} catch {
		return null;
	}
	const currentIndex = used.length - 1;
	const startsX = used.map((c) =>
		c.startedBy === 'reported' && c.startAt ? daysFrom(c.startAt, nowMs) : null
	);
	const fitted = fitAnchored(kept, startsX, parallel);
	const anchored = fitted && fitted.pValue >= ANCHOR_REJECT_P && fitted.df >= 2 ? fitted : null;

	const peaks: CyclePeak[] = [];
	for (let k = 0; k < currentIndex; k++) {
		const c = used[k];
		if (kept[k].xs.length === 0 || c.endAt === null) continue;
		const startX = daysFrom(c.startAt ?? c.points[0].at, nowMs);
		const endX = daysFrom(c.endAt, nowMs);
		peaks.push({
			at: c.endAt,
			peakMbar: anchored ? anchoredLevel(anchored, k, endX) : parallelLevel(parallel, k, endX),
			startMbar: anchored ? anchoredLevel(anchored, k, startX) : parallelLevel(parallel, k, startX)
		});
	}
	return {
		model: anchored ? 'anchored' : 'parallel',
		slopeMbarPerDay: anchored ? anchored.slope : parallel.slope,
		slopeStdErrMbarPerDay: anchored ? anchored.slopeStdErr : parallel.slopeStdErr,
		theilSenMbarPerDay: robust.slope,
		residualStdDevMbar: anchored ? anchored.residualStdDev : parallel.residualStdDev,
		df: anchored ? anchored.df : parallel.df,
		readingsUsed: parallel.n,
		cyclesUsed: parallel.groups.filter((g) => g.n > 0).length,
		screenedOut,
		currentLine: anchored
			? anchoredLine(anchored, currentIndex)
			: lineForGroup(parallel, currentIndex),
		// Theil–Sen intercepts are levels at x = 0, which is `now`.
		currentTheilSenMbar: robust.intercepts[currentIndex],
		baselineMbarPerDay: anchored ? anchored.baselineSlope : null,
		anchoredPValue: fitted?.pValue ?? null,
		peaks
	};
}

/** Days from `nowMs` to `at` (negative in the past). */
function daysFrom(at: Date, nowMs: number): number {
	return (at.getTime() - nowMs) / MS_PER_DAY;
}

/** One cycle's readings as x (days relative to now) and y (Δp, mbar). */
interface CycleData {
	xs: number[];
	ys: number[];
}

function cycleData(points: readonly SeriesPoint[], nowMs: number): CycleData {
	// Plain arrays filled by push (packed): small typed arrays cost more to allocate than they
	// save, and this runs for every cycle of every van.
	const xs: number[] = [];
	const ys: number[] = [];
	for (const p of points) {
		xs.push(daysFrom(p.at, nowMs));
		ys.push(p.deltaPMbar);
	}
	return { xs, ys };
}

function hasDistinctTimes(g: CycleData): boolean {
	return g.xs.length >= 2 && g.xs[g.xs.length - 1] > g.xs[0];
}

/** Level of cycle k at x under the parallel lines. */
function parallelLevel(parallel: PooledFit, k: number, x: number): number {
	const g = parallel.groups[k];
	return g.yMean + parallel.slope * (x - g.xMean);
}

interface AnchoredFit {
	slope: number;
	slopeStdErr: number;
	baselineSlope: number;
	residualStdDev: number;
	df: number;
	pValue: number;
	model: LinearModelFit;
	/** Per cycle: its regeneration time (anchored) or null (free level). */
	startsX: readonly (number | null)[];
	/** Per free cycle with readings: its level's column in the model. */
	freeColumn: ReadonlyMap<number, number>;
}

/**
 * Regeneration-anchored model. Rows of a cycle k that began at a reported regeneration at
 * time s_k: y = β0 + β1·s_k + b·(x − s_k); rows of other cycles: y = α_k + b·x.
 * Needs the current cycle anchored and 3+ anchored cycles with readings.
 * The F-test compares it with parallel lines (which frees every anchored level):
 * F = ((SSE_a − SSE_p)/q) / (SSE_p/df_p), q = df_a − df_p.
 */
function fitAnchored(
	kept: readonly GroupData[],
	startsX: readonly (number | null)[],
	parallel: PooledFit
): AnchoredFit | null {
	const current = kept.length - 1;
	if (startsX[current] === null) return null;
	const anchoredGroups = kept.filter((g, k) => startsX[k] !== null && g.xs.length > 0).length;
	if (anchoredGroups < 3) return null;
	// Columns: β0, β1, b, then one level per free cycle with readings.
	const freeColumn = new Map<number, number>();
	kept.forEach((g, k) => {
		if (startsX[k] === null && g.xs.length > 0) freeColumn.set(k, 3 + freeColumn.size);
	});
	const p = 3 + freeColumn.size;
	const n = parallel.n;
	// Plain arrays: small typed arrays cost more to allocate than they save here.
	const rows = new Array<number>(n * p).fill(0);
	const ys = new Array<number>(n);
	let row = 0;
	for (let k = 0; k < kept.length; k++) {
		const g = kept[k];
		const s = startsX[k];
		for (let i = 0; i < g.xs.length; i++) {
			const base = row * p;
			if (s !== null) {
				rows[base] = 1;
				rows[base + 1] = s;
				rows[base + 2] = g.xs[i] - s;
			} else {
				rows[base + 2] = g.xs[i];
				rows[base + (freeColumn.get(k) as number)] = 1;
			}
			ys[row++] = g.ys[i];
		}
	}
	let fit: LinearModelFit;
	try {
		fit = fitLinearModel(rows, ys, p);
	} catch {
		return null;
	}
	const q = fit.df - parallel.df;
	if (q < 1 || parallel.df < 1) return null;
	const f = (fit.sse - parallel.sse) / q / (parallel.sse / parallel.df);
	const pValue =
		f > 0 ? 1 - regularizedBeta((q * f) / (q * f + parallel.df), q / 2, parallel.df / 2) : 1;
	const s2 = fit.residualStdDev * fit.residualStdDev;
	return {
		slope: fit.coefficients[2],
		slopeStdErr: Math.sqrt(s2 * fit.unscaledCovariance[2 * p + 2]),
		baselineSlope: fit.coefficients[1],
		residualStdDev: fit.residualStdDev,
		df: fit.df,
		pValue,
		model: fit,
		startsX,
		freeColumn
	};
}

/** The line of anchored cycle k, with its covariance. */
function anchoredLine(anchored: AnchoredFit, k: number): LineWithError {
	const { coefficients, unscaledCovariance: u, p, residualStdDev, df } = anchored.model;
	const [b0, b1, b] = coefficients;
	const s2 = residualStdDev * residualStdDev;
	const s = anchored.startsX[k] as number;
	// anchorY = β0 + s·β1: var = U00 + 2s·U01 + s²·U11; cov with b = U02 + s·U12.
	return {
		slope: b,
		anchorX: s,
		anchorY: b0 + b1 * s,
		anchorVariance: s2 * (u[0] + 2 * s * u[1] + s * s * u[p + 1]),
		anchorSlopeCovariance: s2 * (u[2] + s * u[p + 2]),
		slopeVariance: s2 * u[2 * p + 2],
		residualStdDev,
		df
	};
}

/** Level of cycle k at x under the anchored model (NaN for a free cycle without readings). */
function anchoredLevel(anchored: AnchoredFit, k: number, x: number): number {
	const [b0, b1, b] = anchored.model.coefficients;
	const s = anchored.startsX[k];
	if (s !== null) return b0 + b1 * s + b * (x - s);
	const column = anchored.freeColumn.get(k);
	return column === undefined ? Number.NaN : anchored.model.coefficients[column] + b * x;
}

const MIN_SCREEN_SCALE_MBAR = 1;
let differenceScratch = new Float64Array(1024);

/**
 * How far from its cycle's Theil–Sen line a reading may lie and still be kept: `cutoff` robust
 * sds. The scale comes from differences of consecutive residuals within a cycle, which do
 * not depend on the cycle's level: r_i − r_(i−1) ≈ ε_i − ε_(i−1) has sd σ·√2, so
 * σ ≈ median|r_i − r_(i−1)| / (0.6745·√2) (a normal-consistent, MAD-like estimate; the MAD of
 * residuals around each cycle's own median runs low on cycles of three or four readings),
 * floored at 1 mbar. Null (nothing is screened) with fewer than 6 such differences.
 */
function screeningLimit(
	groups: readonly CycleData[],
	slope: number,
	intercepts: readonly number[],
	cutoff: number
): number | null {
	let pairs = 0;
	for (const g of groups) pairs += Math.max(0, g.xs.length - 1);
	if (pairs < 6) return null;
	// One reused buffer: the engine runs this for every van.
	if (differenceScratch.length < pairs) differenceScratch = new Float64Array(pairs * 2);
	let count = 0;
	for (let k = 0; k < groups.length; k++) {
		const { xs, ys } = groups[k];
		const intercept = intercepts[k];
		let previous = ys[0] - intercept - slope * xs[0];
		for (let i = 1; i < xs.length; i++) {
			const r = ys[i] - intercept - slope * xs[i];
			differenceScratch[count++] = Math.abs(r - previous);
			previous = r;
		}
	}
	// Floor at 1 mbar, about a Δp reading's resolution: exact or rounded data must not turn
	// rounding residue into "outliers".
	const scale = Math.max(
		MIN_SCREEN_SCALE_MBAR,
		medianInPlace(differenceScratch, count) / (0.6745 * Math.SQRT2)
	);
	return cutoff * scale;
}

/**
 * The cycle's readings within `limit` of its robust line (all of them when `limit` is null);
 * the rest are appended to `screenedOut`. A cycle's only kept reading is never screened out:
 * when none is within the limit, its first reading stays.
 */
function keepScreened(
	g: CycleData,
	line: { slope: number; intercept: number; limit: number | null },
	points: readonly SeriesPoint[],
	screenedOut: SeriesPoint[]
): CycleData {
	const { slope, intercept, limit } = line;
	const m = g.xs.length;
	if (limit === null) return g;
	let count = 0;
	for (let i = 0; i < m; i++) if (isWithin(g, i, intercept, slope, limit)) count++;
	if (count === m) return g;
	const keepFirst = count === 0;
	const xs: number[] = [];
	const ys: number[] = [];
	for (let i = 0; i < m; i++) {
		if (isWithin(g, i, intercept, slope, limit) || (keepFirst && i === 0)) {
			xs.push(g.xs[i]);
			ys.push(g.ys[i]);
		} else screenedOut.push(points[i]);
	}
	return { xs, ys };
}

function isWithin(g: CycleData, i: number, intercept: number, slope: number, limit: number) {
	return Math.abs(g.ys[i] - intercept - slope * g.xs[i]) <= limit;
}

/**
 * Distance driven per day: Theil–Sen slope of odometer against time over the look-back window,
 * so one mistyped odometer does not move it. At most 60 evenly spaced readings take part
 * (keeps the O(n²) pairs bounded). Null without two readings at distinct times.
 */
export function estimateKmPerDay(
	readings: readonly { at: Date; odometerKm: number }[],
	now: Date,
	lookbackDays: number
): number | null {
	const nowMs = now.getTime();
	const fromMs = nowMs - lookbackDays * MS_PER_DAY;
	const inWindow = sortedByTime(
		readings.filter((r) => r.at.getTime() >= fromMs && r.at.getTime() <= nowMs)
	);
	if (inWindow.length < 2) return null;
	const step = Math.max(1, Math.ceil(inWindow.length / 60));
	const xs: number[] = [];
	const ys: number[] = [];
	for (let i = 0; i < inWindow.length; i += step) {
		xs.push(daysFrom(inWindow[i].at, nowMs));
		ys.push(inWindow[i].odometerKm);
	}
	try {
		return Math.max(0, fitTheilSen(xs, ys).slope);
	} catch {
		return null;
	}
}

export interface CloudFit {
	/** Least-squares line through all readings of the window, x in days relative to `now`. */
	line: LineWithError;
	theilSenMbarPerDay: number;
	/** 90th percentile of the residuals: how far above the line the saw-tooth's upper edge runs, mbar. */
	upperEdgeMbar: number;
	readingsUsed: number;
}

/**
 * For vans that regenerate more often than they are read: the readings sample the saw-tooth
 * at random points of its cycle, so no cycle shows its own growth. The trend of all readings
 * in the window is then the trend of the cycle's average; its upper edge (the 90th percentile
 * of the residuals) stands in for the peaks. Null with fewer than 3 readings or one time.
 */
export function fitCloud(
	points: readonly SeriesPoint[],
	now: Date,
	lookbackDays: number
): CloudFit | null {
	const nowMs = now.getTime();
	const fromMs = nowMs - lookbackDays * MS_PER_DAY;
	const inWindow = points.filter((p) => p.at.getTime() >= fromMs);
	if (inWindow.length < 3) return null;
	const xs = inWindow.map((p) => (p.at.getTime() - nowMs) / MS_PER_DAY);
	const ys = inWindow.map((p) => p.deltaPMbar);
	let fit;
	try {
		fit = fitOls(xs, ys);
	} catch {
		return null;
	}
	const residuals = ys.map((y, i) => y - fit.intercept - fit.slope * xs[i]).sort((a, b) => a - b);
	const upperEdgeMbar =
		residuals[Math.min(residuals.length - 1, Math.floor(0.9 * residuals.length))];
	return {
		line: lineFromOls(fit),
		theilSenMbarPerDay: fitTheilSen(xs, ys).slope,
		upperEdgeMbar,
		readingsUsed: inWindow.length
	};
}
