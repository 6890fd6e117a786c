/**
 * When will this van's Δp cross the concern line? One comparable series, its current epoch,
 * regeneration cycles, a common within-cycle growth line, and a Student-t interval for the
 * crossing date — or an honest "not enough data" / "no crossing within the horizon".
 * Pure: `now` comes in, nothing is read from the clock.
 */
import {
	buildSeries,
	chooseComparableSeries,
	SERIES_LABELS,
	type ComparableSeries,
	type PressureReading,
	type SeriesPoint,
	type SeriesKind,
	type SeriesOptions
} from './series';
import { fitOls, inversePrediction, lineFromOls, type LineWithError } from './stats/ols';
import { fitTheilSen, median } from './stats/theil-sen';
import {
	estimateKmPerDay,
	findEpoch,
	fitCloud,
	fitGrowth,
	MS_PER_DAY,
	splitIntoCycles,
	type FilterEvent,
	type GrowthFit,
	type TrendOptions
} from './trend';

export interface ForecastOptions extends SeriesOptions, TrendOptions {
	/** Force a series kind instead of choosing one. */
	seriesKind?: SeriesKind;
	/** Concern line for the chosen series, mbar (default: the series kind's line, 300 on road load). */
	concernMbar?: number;
	/** Central coverage of the crossing interval, 0.5–0.99 (default 0.8). */
	level?: number;
	/**
	 * What the interval is for: `level` — the date the filter's true Δp reaches the line
	 * (inverts the t-band of the fitted line); `reading` — the date a single new reading would
	 * (inverts the prediction band, wider). Default `level`.
	 */
	intervalKind?: 'level' | 'reading';
	/** Crossings further out than this are reported as "none within the horizon", days (default 365). */
	horizonDays?: number;
	/** Fewest comparable readings in the epoch for a forecast (default 6). */
	minReadings?: number;
	/** Shortest span from first to last reading of the epoch, days (default 21). */
	minSpanDays?: number;
	/** A last reading older than this is too stale to forecast from, days (default 90). */
	maxReadingAgeDays?: number;
	/**
	 * Interrupted regenerations reported in the current cycle from which the forecast assumes
	 * regenerations keep failing (default 3; one or two before a completed one are ordinary).
	 */
	interruptionsToAssumeFailing?: number;
}

export interface ForecastInput {
	readings: readonly PressureReading[];
	events: readonly FilterEvent[];
	now: Date;
	options?: ForecastOptions;
}

export type ForecastState =
	'insufficient_data' | 'implausible_readings' | 'over_line' | 'crossing' | 'no_crossing';

/**
 * Which line the crossing comes from:
 * - `single_cycle`: no completed regeneration in view — the current rise is projected;
 * - `not_regenerating`: regenerations are being interrupted or the level is past where this
 *   van usually regenerates — the current rise is projected, assuming that continues;
 * - `keeping_up`: regenerations complete as usual — the pre-regeneration peaks are projected;
 * - `frequent_regenerations`: regenerations come faster than readings, so no cycle shows its
 *   growth — the upper edge of all readings (their 90th percentile around the trend) is projected.
 */
export type ForecastMode =
	'single_cycle' | 'not_regenerating' | 'keeping_up' | 'frequent_regenerations';

export type ConfidenceGrade = 'firm' | 'fair' | 'rough';

export interface CrossingForecast {
	state: ForecastState;
	series: {
		kind: SeriesKind;
		label: string;
		rule: string;
		concernMbar: number;
		readingsInEpoch: number;
		epochStartAt: Date | null;
		lastReadingAt: Date | null;
		lastReadingMbar: number | null;
	};
	mode: ForecastMode | null;
	growth: {
		/** `anchored`: cycles start from a shared, slowly moving baseline; `parallel`: each cycle at its own level. */
		model: 'parallel' | 'anchored';
		mbarPerDay: number;
		mbarPerWeek: number;
		mbarPer1000Km: number | null;
		theilSenMbarPerDay: number;
		stdErrMbarPerDay: number;
		residualStdDevMbar: number;
		readingsUsed: number;
		cyclesUsed: number;
		screenedOut: number;
	} | null;
	/** Trend of the post-regeneration level (ash), from 3+ completed cycles. */
	baseline: { mbarPerDay: number; mbarPer1000Km: number | null; cycles: number } | null;
	kmPerDay: number | null;
	/** Fitted level now, mbar. */
	currentLevelMbar: number | null;
	/** Median fitted level just before this van's recent regenerations, mbar. */
	typicalPeakMbar: number | null;
	regenerations: {
		reported: number;
		detected: number;
		interruptedInCurrentCycle: number;
		/** Distance per completed regeneration over the epoch, km (null with fewer than 2). */
		kmBetween: number | null;
	};
	crossing: {
		earliest: Date | null;
		expected: Date | null;
		latest: Date | null;
		level: number;
		intervalKind: 'level' | 'reading';
		/** True when the expected crossing lies beyond the horizon (then `expected` is null). */
		beyondHorizon: boolean;
	};
	confidence: { grade: ConfidenceGrade; reason: string };
	/** Short plain-English account with the numbers it rests on. */
	explanation: string;
}

/**
 * Road-load (or equivalent) Δp below this on a running engine is implausible for any filter:
 * a flat, near-zero trace under load points at a leaking sensor pipe.
 * check value: common trade practice, no published source; idle is not checked (it can read near zero).
 */
export const IMPLAUSIBLY_LOW_MBAR: Readonly<Record<SeriesKind, number>> = Object.freeze({
	flow_normalised: 20,
	road_load: 20,
	raised_idle: 10,
	idle: 0
});

const DEFAULTS = {
	level: 0.8,
	intervalKind: 'level' as 'level' | 'reading',
	horizonDays: 365,
	minReadings: 6,
	minSpanDays: 21,
	maxReadingAgeDays: 90,
	interruptionsToAssumeFailing: 3,
	lookbackDays: 365,
	outlierCutoff: 4.5
};

/**
 * Forecasts when the van's comparable Δp series crosses its concern line.
 * Method and every default: docs/method.md.
 */
export function forecastCrossing(input: ForecastInput): CrossingForecast {
	const { readings, events, now } = input;
	const o = { ...DEFAULTS, ...stripUndefined(input.options ?? {}) };
	const nowMs = now.getTime();
	const series: ComparableSeries = o.seriesKind
		? {
				...buildSeries(readings, o.seriesKind, o),
				rule: `Uses ${SERIES_LABELS[o.seriesKind]} as asked.`
			}
		: chooseComparableSeries(readings, o);
	const concernMbar = o.concernMbar ?? series.limit.concernMbar;
	const epoch = findEpoch(series.points, events, now);
	const points = epoch.points;
	const last = points.length ? points[points.length - 1] : null;

	const result: CrossingForecast = {
		state: 'insufficient_data',
		series: {
			kind: series.kind,
			label: SERIES_LABELS[series.kind],
			rule: series.rule,
			concernMbar,
			readingsInEpoch: points.length,
			epochStartAt: epoch.startAt,
			lastReadingAt: last?.at ?? null,
			lastReadingMbar: last?.deltaPMbar ?? null
		},
		mode: null,
		growth: null,
		baseline: null,
		kmPerDay: null,
		currentLevelMbar: null,
		typicalPeakMbar: null,
		regenerations: { reported: 0, detected: 0, interruptedInCurrentCycle: 0, kmBetween: null },
		crossing: {
			earliest: null,
			expected: null,
			latest: null,
			level: o.level,
			intervalKind: o.intervalKind,
			beyondHorizon: false
		},
		confidence: { grade: 'rough', reason: '' },
		explanation: ''
	};
	const since = epoch.startAt
		? ` since the ${words(epoch.startedBy ?? '')} on ${day(epoch.startAt)}`
		: '';

	// ── Not enough data ──
	if (points.length < o.minReadings) {
		return insufficient(
			result,
			`${points.length} comparable reading${points.length === 1 ? '' : 's'} (${series.kind.replace('_', ' ')})${since}; a forecast needs at least ${o.minReadings}.`
		);
	}
	const spanDays = (points[points.length - 1].at.getTime() - points[0].at.getTime()) / MS_PER_DAY;
	if (spanDays < o.minSpanDays) {
		return insufficient(
			result,
			`the ${points.length} readings${since} span ${spanDays.toFixed(0)} days; a forecast needs at least ${o.minSpanDays}.`
		);
	}
	const ageDays = -daysFrom((last as { at: Date }).at, nowMs);
	if (ageDays > o.maxReadingAgeDays) {
		return insufficient(
			result,
			`the last comparable reading is ${ageDays.toFixed(0)} days old; a forecast needs one within ${o.maxReadingAgeDays}.`
		);
	}

	// ── Implausibly low under load ──
	const floor = IMPLAUSIBLY_LOW_MBAR[series.kind];
	const recent = points.slice(-3);
	if (floor > 0 && recent.every((p) => p.deltaPMbar < floor)) {
		result.state = 'implausible_readings';
		result.confidence = {
			grade: 'rough',
			reason: `the last ${recent.length} readings are all below ${floor} mbar, which a running engine under load does not give.`
		};
		result.explanation =
			`The last ${recent.length} ${SERIES_LABELS[series.kind]} read ${recent.map((p) => p.deltaPMbar.toFixed(0)).join(', ')} mbar: ` +
			`implausibly low under load (below ${floor} mbar). Check the sensor and its pipes before trusting any forecast.`;
		return result;
	}

	// ── Cycles and growth ──
	const dropThresholdMbar = o.dropThresholdMbar ?? 0.1 * concernMbar;
	const split = splitIntoCycles(epoch, events, now, dropThresholdMbar);
	const current = split.cycles[split.cycles.length - 1];
	const kmPerDay = estimateKmPerDay(readings, now, o.lookbackDays);
	result.kmPerDay = kmPerDay;
	const completed = split.reportedCount + split.detectedCount;
	const epochKm = points[points.length - 1].odometerKm - points[0].odometerKm;
	result.regenerations = {
		reported: split.reportedCount,
		detected: split.detectedCount,
		interruptedInCurrentCycle: current.interruptedCount,
		// Regenerations per distance tell the soot rate even when readings are too sparse to.
		kmBetween: completed >= 2 && epochKm > 0 ? epochKm / completed : null
	};
	const ctx = { result, o, now, concernMbar, since, lastPoint: last as SeriesPoint };

	const growth = fitGrowth(split.cycles, now, o);
	if (growth === null || growth.df < 2) {
		// Regenerations come faster than readings: follow the upper edge of the readings.
		const regenerations = split.reportedCount + split.detectedCount;
		const cloud =
			regenerations >= split.cycles.length / 2 ? fitCloud(points, now, o.lookbackDays) : null;
		if (cloud === null || cloud.line.df < 2) {
			return insufficient(
				result,
				`regenerations split the ${points.length} readings${since} into cycles too short to measure growth (fewer than two readings each, or too few in all).`
			);
		}
		const slope = cloud.line.slope;
		result.mode = 'frequent_regenerations';
		result.growth = null;
		result.baseline = {
			mbarPerDay: slope,
			mbarPer1000Km: per1000Km(slope, kmPerDay),
			cycles: regenerations
		};
		const target = { ...cloud.line, anchorY: cloud.line.anchorY + cloud.upperEdgeMbar };
		result.currentLevelMbar = target.anchorY + slope * (0 - target.anchorX);
		const growthNote =
			`${capitalise(SERIES_LABELS[series.kind])}${since}: regenerations (${regenerations}) come more often than readings, so no cycle shows its own growth. ` +
			`The readings' upper edge (the level one in ten exceeds) is ${result.currentLevelMbar.toFixed(0)} mbar now and moves ${(slope * 7).toFixed(2)} mbar/week ` +
			`(Theil–Sen ${(cloud.theilSenMbarPerDay * 7).toFixed(2)}; ${cloud.readingsUsed} readings).`;
		return conclude(ctx, {
			target,
			notes: [growthNote],
			cyclePoints: points.slice(-2),
			levelAtLast: result.currentLevelMbar,
			grading: {
				readingsUsed: cloud.readingsUsed,
				olsSlope: slope,
				theilSenSlope: cloud.theilSenMbarPerDay,
				fromPeaks: true,
				peakCount: regenerations
			}
		});
	}

	// A regeneration after the last reading leaves the current cycle empty: only the anchored
	// model knows its level; either way the van has just regenerated.
	const currentKnown = current.points.length > 0 || growth.model === 'anchored';
	if (!currentKnown && growth.peaks.length === 0) {
		return insufficient(
			result,
			`a regeneration was reported after the last reading and there is no completed cycle to go by; the next reading will start the new cycle.`
		);
	}
	result.growth = {
		model: growth.model,
		mbarPerDay: growth.slopeMbarPerDay,
		mbarPerWeek: growth.slopeMbarPerDay * 7,
		mbarPer1000Km: per1000Km(growth.slopeMbarPerDay, kmPerDay),
		theilSenMbarPerDay: growth.theilSenMbarPerDay,
		stdErrMbarPerDay: growth.slopeStdErrMbarPerDay,
		residualStdDevMbar: growth.residualStdDevMbar,
		readingsUsed: growth.readingsUsed,
		cyclesUsed: growth.cyclesUsed,
		screenedOut: growth.screenedOut.length
	};
	const line = growth.currentLine;
	result.currentLevelMbar = currentKnown ? lineLevel(line, 0) : null;
	const baseline = baselineTrend(growth);
	if (baseline) {
		result.baseline = { ...baseline, mbarPer1000Km: per1000Km(baseline.mbarPerDay, kmPerDay) };
	}
	const recentPeaks = growth.peaks.slice(-6);
	const typicalPeak = recentPeaks.length ? median(recentPeaks.map((p) => p.peakMbar)) : null;
	result.typicalPeakMbar = typicalPeak;

	// ── Mode ──
	const cyclePoints = current.points;
	const lastInCycle = cyclePoints.length ? cyclePoints[cyclePoints.length - 1] : null;
	const levelAtLast = lineLevel(line, lastInCycle ? daysFrom(lastInCycle.at, nowMs) : 0);
	let mode: ForecastMode;
	if (typicalPeak === null) mode = 'single_cycle';
	else {
		const typicalRise = median(recentPeaks.map((p) => p.peakMbar - p.startMbar));
		const margin = Math.max(2 * growth.residualStdDevMbar, 0.1 * Math.max(typicalRise, 0));
		// One or two interrupted attempts before a completed one are ordinary on short trips.
		const failing =
			current.interruptedCount >= o.interruptionsToAssumeFailing ||
			(lastInCycle !== null && levelAtLast > typicalPeak + margin);
		mode = failing && currentKnown ? 'not_regenerating' : 'keeping_up';
	}
	result.mode = mode;

	// ── The line whose crossing we forecast ──
	let target: LineWithError | null = line;
	let modeNote = '';
	if (mode === 'keeping_up' && typicalPeak !== null && typicalPeak < concernMbar) {
		target = peakLine(growth, nowMs);
		modeNote =
			target === null
				? `Regenerations are keeping up: peaks around ${typicalPeak.toFixed(0)} mbar, ${(concernMbar - typicalPeak).toFixed(0)} mbar below the line; too few cycles to trend the peaks.`
				: `Regenerations are keeping up: peaks around ${typicalPeak.toFixed(0)} mbar; the forecast follows the trend of the peaks (${(target.slope * 7).toFixed(1)} mbar/week over ${growth.peaks.length} cycles).`;
	} else if (mode === 'not_regenerating') {
		modeNote =
			current.interruptedCount >= o.interruptionsToAssumeFailing
				? `Regenerations are not completing: ${current.interruptedCount} interrupted since the last completed one; the forecast assumes that continues.`
				: `The level is past where this van usually regenerates (${(typicalPeak as number).toFixed(0)} mbar); the forecast assumes regenerations keep failing.`;
	}
	return conclude(ctx, {
		target,
		notes: [growthSentence(result, since), modeNote],
		cyclePoints,
		levelAtLast: lastInCycle ? levelAtLast : null,
		grading: {
			readingsUsed: growth.readingsUsed,
			olsSlope: growth.slopeMbarPerDay,
			theilSenSlope: growth.theilSenMbarPerDay,
			fromPeaks: target !== line,
			peakCount: growth.peaks.length
		}
	});
}

interface ConcludeContext {
	result: CrossingForecast;
	o: typeof DEFAULTS & ForecastOptions;
	now: Date;
	concernMbar: number;
	since: string;
	lastPoint: SeriesPoint;
}

interface ConcludeInput {
	/** The line whose crossing is forecast; null when there is none to project. */
	target: LineWithError | null;
	/** Sentences on the numbers behind the forecast. */
	notes: string[];
	/** Readings of the current cycle (for "already over the line"). */
	cyclePoints: readonly SeriesPoint[];
	/** Fitted level at the current cycle's last reading, mbar. */
	levelAtLast: number | null;
	grading: Omit<GradingFacts, 'earliestX' | 'expectedX' | 'latestX' | 'lastX' | 'levelPct'>;
}

/** Over the line, crossing, or none within the horizon — with the interval, grade and explanation. */
function conclude(ctx: ConcludeContext, input: ConcludeInput): CrossingForecast {
	const { result, o, now, concernMbar, lastPoint } = ctx;
	const nowMs = now.getTime();
	const lastX = daysFrom(lastPoint.at, nowMs);
	const levelPct = `${Math.round(o.level * 100)} %`;
	const lastText = `${lastPoint.deltaPMbar.toFixed(0)} mbar on ${day(lastPoint.at)}`;
	const { target, cyclePoints } = input;

	// ── Over the line already? ──
	const lastTwo = cyclePoints.slice(-2);
	const readingsOver = lastTwo.length > 0 && lastTwo.every((p) => p.deltaPMbar >= concernMbar);
	const lastInCycle = cyclePoints.length ? cyclePoints[cyclePoints.length - 1] : null;
	const fittedOver =
		lastInCycle !== null &&
		input.levelAtLast !== null &&
		input.levelAtLast >= concernMbar &&
		lastInCycle.deltaPMbar >= concernMbar;
	if (readingsOver || fittedOver) {
		const over = cyclePoints.filter((p) => p.deltaPMbar >= concernMbar).length;
		result.state = 'over_line';
		result.confidence = {
			grade: readingsOver && lastTwo.length === 2 ? 'firm' : 'fair',
			reason: readingsOver
				? `the last ${lastTwo.length} reading${lastTwo.length === 1 ? ' is' : 's are'} at or above ${concernMbar} mbar.`
				: `the last reading and the fitted level are at or above ${concernMbar} mbar.`
		};
		result.explanation = withNotes(
			input.notes,
			`Over the line: ${over} recent reading${over === 1 ? '' : 's'} at or above ${concernMbar} mbar, the last ${lastText}.`
		);
		return result;
	}

	if (target === null || !(target.slope > 0)) {
		result.state = 'no_crossing';
		result.crossing.beyondHorizon = true;
		result.confidence = {
			grade: target !== null && input.grading.readingsUsed >= 12 ? 'fair' : 'rough',
			reason:
				target !== null
					? `the level is not rising (${(target.slope * 7).toFixed(1)} mbar/week).`
					: 'regenerations keep up, but there are too few completed cycles to trend their peaks.'
		};
		result.explanation = withNotes(
			input.notes,
			`No crossing of ${concernMbar} mbar expected within ${o.horizonDays} days.`
		);
		return result;
	}

	// ── Crossing date and interval ──
	const inverse = inversePrediction(
		target,
		concernMbar,
		o.level,
		o.intervalKind === 'reading' ? 'prediction' : 'mean'
	);
	const expectedX = inverse.estimate as number;
	if (expectedX <= 0) {
		// The trend has passed the line since the last reading: treat as over, and say why.
		result.state = 'over_line';
		result.crossing.expected = dateAt(nowMs, expectedX);
		result.confidence = {
			grade: 'fair',
			reason: `no reading is over the line yet, but the trend reached ${concernMbar} mbar on ${day(dateAt(nowMs, expectedX))}.`
		};
		result.explanation = withNotes(
			input.notes,
			`Probably over the line: the trend reached ${concernMbar} mbar on ${day(dateAt(nowMs, expectedX))}, after the last reading (${lastText}). Take a reading to confirm.`
		);
		return result;
	}
	// The earliest likely date is never before today: the forecast looks forward.
	const earliestX = inverse.lower === null ? null : Math.max(0, inverse.lower);
	const latestX = inverse.upper;
	result.crossing.earliest =
		earliestX === null || earliestX > o.horizonDays ? null : dateAt(nowMs, earliestX);
	if (expectedX > o.horizonDays) {
		result.state = 'no_crossing';
		result.crossing.beyondHorizon = true;
		const earliestInside = result.crossing.earliest !== null;
		result.confidence = {
			grade: earliestInside ? 'fair' : input.grading.readingsUsed >= 12 ? 'firm' : 'fair',
			reason: earliestInside
				? `the expected crossing (${day(dateAt(nowMs, expectedX))}) lies beyond the ${o.horizonDays}-day horizon, but the ${levelPct} interval starts on ${day(result.crossing.earliest as Date)}.`
				: `even the earliest likely crossing (${levelPct} interval) lies beyond the ${o.horizonDays}-day horizon.`
		};
		result.explanation = withNotes(
			input.notes,
			`No crossing of ${concernMbar} mbar expected within ${o.horizonDays} days (the trend reaches it around ${day(dateAt(nowMs, expectedX))}).`
		);
		return result;
	}
	result.state = 'crossing';
	result.crossing.expected = dateAt(nowMs, expectedX);
	result.crossing.latest = latestX === null ? null : dateAt(nowMs, latestX);
	result.confidence = gradeCrossing({
		...input.grading,
		earliestX,
		expectedX,
		latestX,
		lastX,
		levelPct
	});
	const interval =
		latestX === null
			? `${levelPct} interval from ${day(result.crossing.earliest ?? now)}, open-ended: growth not clearly above zero`
			: `${levelPct} interval ${day(result.crossing.earliest ?? now)} to ${day(dateAt(nowMs, latestX))}`;
	result.explanation = withNotes(
		input.notes,
		`Expected to reach ${concernMbar} mbar on ${day(dateAt(nowMs, expectedX))} (${interval}).`
	);
	return result;
}

function capitalise(text: string): string {
	return text.charAt(0).toUpperCase() + text.slice(1);
}

function growthSentence(result: CrossingForecast, since: string): string {
	const g = result.growth;
	if (!g) return '';
	const per1000 =
		g.mbarPer1000Km === null
			? ''
			: `, ${g.mbarPer1000Km.toFixed(1)} per 1,000 km at ${(result.kmPerDay as number).toFixed(0)} km/day`;
	const screened = g.screenedOut
		? `; ${g.screenedOut} outlying reading${g.screenedOut === 1 ? '' : 's'} left out`
		: '';
	const ash = result.baseline
		? ` Post-regeneration baseline ${result.baseline.mbarPerDay >= 0 ? 'rising' : 'falling'} ${Math.abs(result.baseline.mbarPerDay * 7).toFixed(2)} mbar/week${result.baseline.mbarPer1000Km === null ? '' : ` (${result.baseline.mbarPer1000Km.toFixed(2)} per 1,000 km)`}.`
		: '';
	return (
		`${capitalise(result.series.label)}${since}: Δp grows ${g.mbarPerWeek.toFixed(1)} mbar/week within a cycle` +
		`${per1000} (Theil–Sen ${(g.theilSenMbarPerDay * 7).toFixed(1)}; ${g.readingsUsed} readings in ${g.cyclesUsed} cycle${g.cyclesUsed === 1 ? '' : 's'}, scatter ±${g.residualStdDevMbar.toFixed(1)} mbar${screened}).` +
		(result.currentLevelMbar === null
			? ' A regeneration followed the last reading;'
			: ` Fitted level now ${result.currentLevelMbar.toFixed(0)} mbar;`) +
		` last reading ${(result.series.lastReadingMbar as number).toFixed(0)} mbar on ${day(result.series.lastReadingAt as Date)}.${ash}`
	);
}

/**
 * Post-regeneration level against time: the anchored model's baseline slope, or Theil–Sen over
 * the fitted cycle starts; from 3+ completed cycles.
 */
function baselineTrend(growth: GrowthFit): { mbarPerDay: number; cycles: number } | null {
	const peaks = growth.peaks;
	if (peaks.length < 3) return null;
	if (growth.baselineMbarPerDay !== null)
		return { mbarPerDay: growth.baselineMbarPerDay, cycles: peaks.length };
	const xs = peaks.map((p) => p.at.getTime() / MS_PER_DAY);
	const ys = peaks.map((p) => p.startMbar);
	try {
		return { mbarPerDay: fitTheilSen(xs, ys).slope, cycles: peaks.length };
	} catch {
		return null;
	}
}

/**
 * Least-squares line through the completed cycles' peaks (x in days relative to now), from
 * 3+ peaks spanning 28+ days; null otherwise.
 */
function peakLine(growth: GrowthFit, nowMs: number): LineWithError | null {
	const peaks = growth.peaks;
	if (peaks.length < 3) return null;
	const xs = peaks.map((p) => daysFrom(p.at, nowMs));
	if (xs[xs.length - 1] - xs[0] < 28) return null;
	try {
		return lineFromOls(
			fitOls(
				xs,
				peaks.map((p) => p.peakMbar)
			)
		);
	} catch {
		return null;
	}
}

interface GradingFacts {
	earliestX: number | null;
	expectedX: number;
	latestX: number | null;
	lastX: number;
	readingsUsed: number;
	olsSlope: number;
	theilSenSlope: number;
	/** Projected from cycle peaks (or the upper edge of the readings), not a measured rise. */
	fromPeaks: boolean;
	peakCount: number;
	levelPct: string;
}

/**
 * Confidence grade of a crossing forecast. `firm`: the interval spans at most half the time
 * to the expected crossing, 12+ readings, Theil–Sen and least squares within 20 %. `fair`: the
 * interval spans at most the time to the crossing and 8+ readings. `rough`: anything else,
 * including an open-ended interval. A projection of peaks from fewer than 6 cycles is at best fair.
 */
function gradeCrossing(a: GradingFacts): { grade: ConfidenceGrade; reason: string } {
	if (a.latestX === null || a.earliestX === null) {
		return {
			grade: 'rough',
			reason: `the growth is not clearly above zero at ${a.levelPct}, so the interval is open-ended.`
		};
	}
	const ahead = Math.max(1, a.expectedX - a.lastX);
	const widthDays = a.latestX - a.earliestX;
	const relWidth = widthDays / ahead;
	const disagreement =
		Math.abs(a.theilSenSlope - a.olsSlope) / Math.max(Math.abs(a.olsSlope), 1e-9);
	const facts =
		`the ${a.levelPct} interval spans ${widthDays.toFixed(0)} days, ${(relWidth * 100).toFixed(0)} % of the ${ahead.toFixed(0)} days from the last reading; ` +
		`${a.readingsUsed} readings; Theil–Sen and least squares differ by ${(disagreement * 100).toFixed(0)} %` +
		(a.fromPeaks ? `; projected from ${a.peakCount} cycle peaks` : '') +
		'.';
	let grade: ConfidenceGrade = 'rough';
	if (relWidth <= 0.5 && a.readingsUsed >= 12 && disagreement <= 0.2) grade = 'firm';
	else if (relWidth <= 1 && a.readingsUsed >= 8) grade = 'fair';
	// A trend of a handful of derived peaks is never firm.
	if (a.fromPeaks && a.peakCount < 6 && grade === 'firm') grade = 'fair';
	return { grade, reason: facts };
}

/** ISO calendar date (UTC), e.g. 2025-06-06: stable across locales. */
function day(at: Date): string {
	// A trend that barely rises reaches the line beyond the dates JavaScript can hold.
	if (Number.isNaN(at.getTime())) return 'a date too far ahead to name';
	return at.toISOString().slice(0, 10);
}

function words(kind: string): string {
	return kind.replace(/_/g, ' ');
}

function stripUndefined<T extends object>(value: T): T {
	return Object.fromEntries(Object.entries(value).filter(([, v]) => v !== undefined)) as T;
}

// Module-level helpers rather than closures inside forecastCrossing: the engine runs once per
// van, and a closure per call (each wrapped for its name under tsx) adds up over a fleet.

function insufficient(result: CrossingForecast, why: string): CrossingForecast {
	result.confidence = { grade: 'rough', reason: why };
	result.explanation = `Not enough data: ${why}`;
	return result;
}

/** Days from `nowMs` to `at` (negative in the past). */
function daysFrom(at: Date, nowMs: number): number {
	return (at.getTime() - nowMs) / MS_PER_DAY;
}

function dateAt(nowMs: number, days: number): Date {
	return new Date(nowMs + days * MS_PER_DAY);
}

/** The line's level at x, mbar. */
function lineLevel(line: LineWithError, x: number): number {
	return line.anchorY + line.slope * (x - line.anchorX);
}

function per1000Km(perDay: number, kmPerDay: number | null): number | null {
	return kmPerDay !== null && kmPerDay > 0.1 ? (perDay / kmPerDay) * 1000 : null;
}

/** The first sentence followed by the non-empty notes. */
function withNotes(notes: readonly string[], first: string): string {
	return [first, ...notes].filter(Boolean).join(' ');
}
