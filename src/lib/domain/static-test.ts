/**
 * Static test of a DPF Δp sensor on the vehicle: a voltage capture through ignition on at rest,
 * crank/start, idle and a stationary throttle blip, judged against trade rules of thumb.
 * See docs/method.md, "Static test".
 */
import { decimateMinMax } from './capture/decimation';
import {
	detectPhases,
	STATIC_PHASES,
	type PhaseBoundaries,
	type PhaseDetection,
	type PhaseDetectionOptions,
	type StaticPhase
} from './capture/phases';
import type { PulsationOptions } from './capture/pulsation';
import { summariseSamples, type SignalSummary } from './capture/summary';
import {
	assertValidSensor,
	checkCircuit,
	checkEngineOffZero,
	DEFAULT_CIRCUIT_LIMITS,
	DEFAULT_SENSOR,
	DEFAULT_ZERO_CHECK,
	makeVerdict,
	mbarPerVolt,
	voltsToMbar,
	worseLevel,
	type CircuitLimits,
	type SensorType,
	type Verdict,
	type VerdictLevel
} from './sensor';

export { STATIC_PHASES, type PhaseBoundaries, type StaticPhase };

/**
 * The trade's rules of thumb are stated in volts for a 0.5–4.5 V, 0–1000 mbar sensor
 * (250 mbar/V); the limits below are those volts turned into mbar through that sensor so they
 * hold for sensors of other ranges.
 */
const TRADE_SENSOR: SensorType = { zeroVolts: 0.5, fullScaleVolts: 4.5, fullScaleMbar: 1000 };

/** Limits a static test is judged against, Δp in mbar. */
export interface StaticTestLimits {
	/** Start-up mean may rise this far above engine off. */
	startupMaxMeanRiseMbar: number;
	/** Idle mean this close to engine off is 'good' ("barely above"). */
	idleGoodMaxRiseMbar: number;
	/** Idle mean Δp up to this is 'acceptable'. */
	idleHealthyMaxMbar: number;
	/** Throttle peak below this is 'good'. */
	throttleGoodMaxPeakMbar: number;
	/** Throttle peak below this is 'acceptable'; at or above it, 'concern'. */
	throttleAcceptableMaxPeakMbar: number;
	/** The portal's concern line; named in reasons when a phase reaches it. */
	concernLineMbar: number;
	/** A throttle peak no higher than this above engine off is a flat, near-zero trace. */
	leakMaxPeakRiseMbar: number;
	/** Engine-off zero tolerance, V. */
	zeroToleranceVolts: number;
	circuit: CircuitLimits;
}

/** Defaults; sources per line. Every one is configurable. */
export const DEFAULT_STATIC_TEST_LIMITS: Readonly<StaticTestLimits> = Object.freeze({
	// Start-up mean rises no more than about 0.1 V: common trade practice, no published source
	startupMaxMeanRiseMbar: 0.1 * mbarPerVolt(TRADE_SENSOR),
	// Idle "barely above engine off", taken as the same 0.1 V: Sootcast default
	idleGoodMaxRiseMbar: 0.1 * mbarPerVolt(TRADE_SENSOR),
	// Healthy idle at most about 100–120 mbar (upper end used): common trade practice
	idleHealthyMaxMbar: 120,
	// Throttle peak below 1.0 V good: common trade practice, no published source
	throttleGoodMaxPeakMbar: voltsToMbar(1.0, TRADE_SENSOR),
	// Throttle peak below 1.3 V acceptable: common trade practice, no published source
	throttleAcceptableMaxPeakMbar: voltsToMbar(1.3, TRADE_SENSOR),
	// Above 300 mbar is a problem: common trade practice; the portal's concern line
	concernLineMbar: 300,
	// Flat, near-zero under throttle: 0.1 V (25 mbar) rise or less. Sootcast default
	leakMaxPeakRiseMbar: 0.1 * mbarPerVolt(TRADE_SENSOR),
	// Sootcast default, see sensor.ts DEFAULT_ZERO_CHECK
	zeroToleranceVolts: DEFAULT_ZERO_CHECK.toleranceVolts,
	// From memory (DOMAIN.md): 0.25 V and 4.75 V
	circuit: DEFAULT_CIRCUIT_LIMITS
});

/** One phase's figures in one unit. Pulsation is p95 − p5 around the local mean. */
export interface PhaseFigures {
	mean: number;
	peak: number;
	min: number;
	pulsation: number;
	/** Standard deviation over the phase. */
	noise: number;
}

export interface PhaseReading {
	startS: number;
	endS: number;
	sampleCount: number;
	volts: PhaseFigures;
	mbar: PhaseFigures;
}

export type StaticCheckName = 'circuit' | 'zero' | 'startup' | 'idle' | 'throttle' | 'pipe-leak';

export interface StaticCheck extends Verdict {
	check: StaticCheckName;
}

export interface StaticTestReport {
	phases: Partial<Record<StaticPhase, PhaseReading>>;
	/** Where the phase boundaries came from. */
	phaseSource: 'technician' | 'detected';
	/** The spans used, s. */
	boundaries: PhaseBoundaries;
	checks: StaticCheck[];
	overall: Verdict;
	/** Notes from phase detection, plain English. */
	notes: string[];
}

export interface StaticTestOptions {
	sensor: SensorType;
	limits: Partial<StaticTestLimits>;
	/** Phase spans marked by the technician; when absent they are detected from the signal. */
	phases: PhaseBoundaries;
	detection: Partial<PhaseDetectionOptions>;
	pulsation: Partial<PulsationOptions>;
}

/**
 * Runs a static test on a capture held in memory (a static test is tens of seconds long).
 * @param timesS sample times, s, non-decreasing
 * @param volts signal, V
 */
export function runStaticTest(
	timesS: ArrayLike<number>,
	volts: ArrayLike<number>,
	options: Partial<StaticTestOptions> = {}
): StaticTestReport {
	if (timesS.length !== volts.length) {
		throw new RangeError('Times and volts must have the same length');
	}
	let boundaries = options.phases;
	let notes: string[] = [];
	const phaseSource = boundaries ? 'technician' : 'detected';
	if (!boundaries) {
		const detection = detectPhasesInSamples(timesS, volts, options.detection);
		boundaries = detection.phases;
		notes = detection.notes;
	}
	const summary = summariseSamples(timesS, volts, {
		phases: boundaries,
		pulsation: options.pulsation ?? {}
	});
	return judgeStaticTest(summary.phases, {
		sensor: options.sensor,
		limits: options.limits,
		overall: summary.overall,
		boundaries,
		phaseSource,
		notes
	});
}

/** Phase detection on samples in memory: window trace by decimation, then `detectPhases`. */
export function detectPhasesInSamples(
	timesS: ArrayLike<number>,
	volts: ArrayLike<number>,
	options: Partial<PhaseDetectionOptions> = {}
): PhaseDetection {
	if (timesS.length === 0) return detectPhases([], options);
	const windowS = options.windowS ?? 0.2;
	const t0S = timesS[0];
	const t1S = timesS[timesS.length - 1];
	const points = Math.max(1, Math.floor((t1S - t0S) / windowS));
	return detectPhases(decimateMinMax(timesS, volts, t0S, t1S, points), options);
}

export interface JudgeOptions {
	sensor?: SensorType;
	limits?: Partial<StaticTestLimits>;
	/** Whole-capture statistics, for the circuit check over every sample. */
	overall?: SignalSummary;
	boundaries?: PhaseBoundaries;
	phaseSource?: 'technician' | 'detected';
	notes?: string[];
}

/**
 * Judges per-phase statistics (from `runStaticTest`, or a streamed `CaptureSummary`).
 * Checks: circuit band, engine-off zero, start-up rise, idle level, throttle peak and a
 * flat, near-zero throttle trace (pipe leak). The overall level is the worst check.
 */
export function judgeStaticTest(
	phases: Partial<Record<StaticPhase, SignalSummary>>,
	options: JudgeOptions = {}
): StaticTestReport {
	const sensor = options.sensor ?? DEFAULT_SENSOR;
	assertValidSensor(sensor);
	const limits = { ...DEFAULT_STATIC_TEST_LIMITS, ...options.limits };
	const readings: Partial<Record<StaticPhase, PhaseReading>> = {};
	for (const phase of STATIC_PHASES) {
		const summary = phases[phase];
		if (summary) readings[phase] = toReading(summary, sensor);
	}
	const leak = judgeLeak(readings, limits, options.phaseSource ?? 'technician');
	// Through a leaking pipe a loaded filter reads low: don't call its levels healthy
	const trustLevels = (verdict: Verdict): Verdict =>
		leak.level === 'fault' && verdict.ok
			? makeVerdict(
					'incomplete',
					`Not judged: the flat throttle trace suggests a pipe leak, so low readings cannot be trusted (${verdict.reason})`
				)
			: verdict;
	const checks: StaticCheck[] = [
		{ check: 'circuit', ...judgeCircuit(phases, options.overall, limits) },
		{ check: 'zero', ...judgeZero(phases.ignitionOn, sensor, limits) },
		{ check: 'startup', ...trustLevels(judgeStartup(readings, limits)) },
		{ check: 'idle', ...trustLevels(judgeIdle(readings, limits)) },
		{ check: 'throttle', ...trustLevels(judgeThrottle(readings, limits)) },
		{ check: 'pipe-leak', ...leak }
	];
	return {
		phases: readings,
		phaseSource: options.phaseSource ?? 'technician',
		boundaries: options.boundaries ?? {},
		checks,
		overall: overallVerdict(checks),
		notes: options.notes ?? []
	};
}

function toReading(s: SignalSummary, sensor: SensorType): PhaseReading {
	const k = mbarPerVolt(sensor);
	return {
		startS: s.firstS,
		endS: s.lastS,
		sampleCount: s.count,
		volts: {
			mean: s.meanVolts,
			peak: s.maxVolts,
			min: s.minVolts,
			pulsation: s.pulsationVolts,
			noise: s.stdDevVolts
		},
		// Levels go through the transfer function; spreads only scale (no zero offset)
		mbar: {
			mean: voltsToMbar(s.meanVolts, sensor),
			peak: voltsToMbar(s.maxVolts, sensor),
			min: voltsToMbar(s.minVolts, sensor),
			pulsation: s.pulsationVolts * k,
			noise: s.stdDevVolts * k
		}
	};
}

function judgeCircuit(
	phases: Partial<Record<StaticPhase, SignalSummary>>,
	overall: SignalSummary | undefined,
	limits: StaticTestLimits
): Verdict {
	let min = overall?.minVolts ?? Infinity;
	let max = overall?.maxVolts ?? -Infinity;
	for (const phase of STATIC_PHASES) {
		const s = phases[phase];
		if (s) {
			min = Math.min(min, s.minVolts);
			max = Math.max(max, s.maxVolts);
		}
	}
	return checkCircuit(min, max, limits.circuit);
}

function judgeZero(
	off: SignalSummary | undefined,
	sensor: SensorType,
	limits: StaticTestLimits
): Verdict {
	if (!off) {
		return makeVerdict(
			'incomplete',
			'No ignition-on, engine-off phase: the sensor zero could not be checked.'
		);
	}
	return checkEngineOffZero(off.meanVolts, sensor, {
		toleranceVolts: limits.zeroToleranceVolts,
		circuit: limits.circuit
	});
}

function judgeStartup(
	r: Partial<Record<StaticPhase, PhaseReading>>,
	limits: StaticTestLimits
): Verdict {
	if (!r.ignitionOn || !r.start) {
		return makeVerdict(
			'incomplete',
			'Start-up not judged: the capture needs both the engine-off and the start phase.'
		);
	}
	const riseMbar = r.start.mbar.mean - r.ignitionOn.mbar.mean;
	const text = `Mean Δp rose ${mbar(riseMbar)} from engine off to start-up`;
	if (riseMbar <= limits.startupMaxMeanRiseMbar) {
		return makeVerdict(
			'good',
			`${text}, within the ${mbar(limits.startupMaxMeanRiseMbar)} allowed.`
		);
	}
	return makeVerdict(
		'concern',
		`${text}, more than the ${mbar(limits.startupMaxMeanRiseMbar)} a free-flowing filter shows: ` +
			'the filter may be loaded.'
	);
}

function judgeIdle(
	r: Partial<Record<StaticPhase, PhaseReading>>,
	limits: StaticTestLimits
): Verdict {
	if (!r.idle) return makeVerdict('incomplete', 'No idle phase: idle Δp not judged.');
	const idleMbar = r.idle.mbar.mean;
	const offMbar = r.ignitionOn?.mbar.mean ?? 0;
	const riseMbar = idleMbar - offMbar;
	const reference = r.ignitionOn ? 'engine off' : 'the sensor zero (no engine-off phase)';
	if (idleMbar >= limits.concernLineMbar) {
		return makeVerdict(
			'concern',
			`Idle mean Δp ${mbar(idleMbar)} is at or above the ${mbar(limits.concernLineMbar)} concern ` +
				'line: the filter is heavily loaded or blocked.'
		);
	}
	if (idleMbar > limits.idleHealthyMaxMbar) {
		return makeVerdict(
			'concern',
			`Idle mean Δp ${mbar(idleMbar)} is above the ${mbar(limits.idleHealthyMaxMbar)} a healthy ` +
				`filter shows at idle (concern line ${mbar(limits.concernLineMbar)}): the filter is loading up.`
		);
	}
	if (riseMbar <= limits.idleGoodMaxRiseMbar) {
		return makeVerdict(
			'good',
			`Idle mean Δp ${mbar(idleMbar)} is barely above ${reference} (+${mbar(riseMbar)}).`
		);
	}
	return makeVerdict(
		'acceptable',
		`Idle mean Δp ${mbar(idleMbar)} is within the healthy ${mbar(limits.idleHealthyMaxMbar)}, ` +
			`but ${mbar(riseMbar)} above ${reference}: some loading.`
	);
}

function judgeThrottle(
	r: Partial<Record<StaticPhase, PhaseReading>>,
	limits: StaticTestLimits
): Verdict {
	if (!r.throttle) {
		return makeVerdict(
			'incomplete',
			'No throttle phase: the stationary-throttle peak was not judged.'
		);
	}
	const peakMbar = r.throttle.mbar.peak;
	const text = `Throttle peak Δp ${mbar(peakMbar)} (${r.throttle.volts.peak.toFixed(2)} V)`;
	if (peakMbar >= limits.concernLineMbar) {
		return makeVerdict(
			'concern',
			`${text} reaches the ${mbar(limits.concernLineMbar)} concern line: the filter is restricting flow.`
		);
	}
	if (peakMbar >= limits.throttleAcceptableMaxPeakMbar) {
		return makeVerdict(
			'concern',
			`${text} is at or above the ${mbar(limits.throttleAcceptableMaxPeakMbar)} limit: the filter ` +
				'is restricting flow.'
		);
	}
	if (peakMbar >= limits.throttleGoodMaxPeakMbar) {
		return makeVerdict(
			'acceptable',
			`${text} is below the ${mbar(limits.throttleAcceptableMaxPeakMbar)} limit but above the ` +
				`${mbar(limits.throttleGoodMaxPeakMbar)} of a clean filter.`
		);
	}
	return makeVerdict(
		'good',
		`${text} is below ${mbar(limits.throttleGoodMaxPeakMbar)}: the filter flows freely.`
	);
}

function judgeLeak(
	r: Partial<Record<StaticPhase, PhaseReading>>,
	limits: StaticTestLimits,
	phaseSource: 'technician' | 'detected'
): Verdict {
	if (!r.throttle) {
		const hint =
			phaseSource === 'detected'
				? ' No throttle rise was found in the signal: if the engine ran and the throttle was ' +
					'applied, the flat trace points to a split or disconnected pipe between filter and sensor.'
				: '';
		return makeVerdict('incomplete', `Pipe leak not judged: no throttle phase.${hint}`);
	}
	const offMbar = r.ignitionOn?.mbar.mean ?? 0;
	const riseMbar = r.throttle.mbar.peak - offMbar;
	const pulsation = `pulsation ${mbar(r.throttle.mbar.pulsation)}`;
	if (riseMbar <= limits.leakMaxPeakRiseMbar) {
		return makeVerdict(
			'fault',
			`Under throttle the trace stays flat and near zero (peak ${mbar(riseMbar)} above engine off, ` +
				`${pulsation}): suspect a split or disconnected pipe between filter and sensor; a ` +
				'blocked filter can look healthy through a leaking pipe.'
		);
	}
	return makeVerdict(
		'good',
		`Δp rises ${mbar(riseMbar)} under throttle (${pulsation}): the pipes carry pressure to the sensor.`
	);
}

function overallVerdict(checks: StaticCheck[]): Verdict {
	let level: VerdictLevel = 'good';
	for (const c of checks) level = worseLevel(level, c.level);
	const failing = checks.filter((c) => c.level === level && level !== 'good');
	if (level === 'good') return makeVerdict('good', 'Every static-test check is good.');
	if (level === 'acceptable') {
		return makeVerdict('acceptable', `Within limits. ${failing.map((c) => c.reason).join(' ')}`);
	}
	return makeVerdict(level, failing.map((c) => c.reason).join(' '));
}

function mbar(value: number): string {
	return `${value.toFixed(0)} mbar`;
}
