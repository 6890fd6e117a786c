/**
 * Phases of a static test capture and how to find them in the signal when the technician has
 * not marked them: ignition on at rest → crank/start → idle → throttle (vehicle stationary).
 */
import type { DecimatedBucket } from './decimation';

export const STATIC_PHASES = ['ignitionOn', 'start', 'idle', 'throttle'] as const;
export type StaticPhase = (typeof STATIC_PHASES)[number];

/** A phase's time span, s: samples with startS ≤ t < endS belong to it. */
export interface PhaseSpan {
	startS: number;
	endS: number;
}

export type PhaseBoundaries = Partial<Record<StaticPhase, PhaseSpan>>;

/** Tuning of the phase detector; all Sootcast defaults, no published source. */
export interface PhaseDetectionOptions {
	/** Window length for the mean/spread trace the detector reads, s. */
	windowS: number;
	/** The capture's first seconds are taken as engine off, ignition on. */
	restLeadS: number;
	/** A window is "running" when its spread exceeds this many times the engine-off spread… */
	activitySpreadFactor: number;
	/** …and at least this much, V (so a very clean engine-off trace does not trip it)… */
	activityMinSpreadVolts: number;
	/** …or when its mean has moved this far from the engine-off mean, V. */
	activityMinShiftVolts: number;
	/** Crank and run-up flare, s, counted from the first running window. */
	startDurationS: number;
	/** Idle reference: median window mean over this long after start-up, s. */
	idleReferenceS: number;
	/** Throttle: window mean above the idle reference by at least this much, V… */
	throttleMinRiseVolts: number;
	/** …and by this many robust standard deviations of the idle window means. */
	throttleSpreadFactor: number;
}

export const DEFAULT_PHASE_DETECTION: Readonly<PhaseDetectionOptions> = Object.freeze({
	windowS: 0.2,
	restLeadS: 1,
	activitySpreadFactor: 4,
	activityMinSpreadVolts: 0.005,
	activityMinShiftVolts: 0.03,
	startDurationS: 3,
	idleReferenceS: 2,
	throttleMinRiseVolts: 0.05,
	throttleSpreadFactor: 5
});

export interface PhaseDetection {
	phases: PhaseBoundaries;
	/** Plain-English notes on what could not be found. */
	notes: string[];
}

/**
 * Finds phase boundaries in a trace of windows (from `decimateMinMax` or a pyramid's
 * `windows()`), values in volts. Heuristic:
 * 1. The first `restLeadS` is engine off; its mean and median window spread are the baseline.
 * 2. Start: the first two consecutive windows whose spread exceeds max(factor × baseline
 *    spread, floor) or whose mean has shifted from the baseline: pulsation has begun.
 * 3. Start lasts `startDurationS` (crank and run-up flare); idle follows.
 * 4. Idle reference: the median window mean over the first `idleReferenceS` of idle; the
 *    throttle phase spans the first to the last window whose mean rises clearly above it
 *    (padded by one window to include the ramps); idle ends where the throttle begins.
 * A capture must open with at least `restLeadS` of engine off.
 */
export function detectPhases(
	windows: readonly DecimatedBucket[],
	options: Partial<PhaseDetectionOptions> = {}
): PhaseDetection {
	const o = { ...DEFAULT_PHASE_DETECTION, ...options };
	const notes: string[] = [];
	if (windows.length === 0) return { phases: {}, notes: ['The capture holds no samples.'] };
	const firstS = windows[0].startS;
	const endS = windows[windows.length - 1].endS;
	const rest = windows.filter((w) => w.endS <= firstS + o.restLeadS + 1e-9);
	const baseline = rest.length > 0 ? rest : [windows[0]];
	const baseMean = weightedMean(baseline);
	const spreadLimit = Math.max(
		o.activitySpreadFactor * median(baseline.map((w) => w.stdDev)),
		o.activityMinSpreadVolts
	);
	const isRunning = (w: DecimatedBucket): boolean =>
		w.stdDev > spreadLimit || Math.abs(w.mean - baseMean) > o.activityMinShiftVolts;
	let startIndex = -1;
	for (let i = baseline.length; i + 1 < windows.length; i++) {
		if (isRunning(windows[i]) && isRunning(windows[i + 1])) {
			startIndex = i;
			break;
		}
	}
	if (startIndex < 0) {
		notes.push(
			'No engine activity found: the trace stays as flat as with the engine off. Either the ' +
				'engine was not started, or the pressure is not reaching the sensor (split or ' +
				'disconnected pipe). Mark the phases by hand to judge the capture.'
		);
		return { phases: { ignitionOn: { startS: firstS, endS } }, notes };
	}
	const startS = windows[startIndex].startS;
	const idleStartS = Math.min(startS + o.startDurationS, endS);
	const phases: PhaseBoundaries = {
		ignitionOn: { startS: firstS, endS: startS },
		start: { startS, endS: idleStartS }
	};
	const idleWindows = windows.filter((w) => w.startS >= idleStartS);
	if (idleWindows.length === 0) {
		notes.push('The capture ends during start-up: no idle or throttle phase to judge.');
		return { phases, notes };
	}
	const reference = idleWindows.filter((w) => w.startS < idleStartS + o.idleReferenceS);
	const refMeans = reference.map((w) => w.mean);
	const refMean = median(refMeans);
	// 1.4826 × median absolute deviation estimates a standard deviation robustly
	const refSpread = 1.4826 * median(refMeans.map((m) => Math.abs(m - refMean)));
	const throttleLimit =
		refMean + Math.max(o.throttleMinRiseVolts, o.throttleSpreadFactor * refSpread);
	const first = idleWindows.findIndex((w) => w.mean > throttleLimit);
	if (first < 0) {
		phases.idle = { startS: idleStartS, endS };
		notes.push(
			'No throttle rise found after idle. If the throttle was applied and the trace stayed ' +
				'flat, suspect a split or disconnected pipe; otherwise repeat the capture with a ' +
				'throttle blip, or mark the throttle phase by hand.'
		);
		return { phases, notes };
	}
	let last = first;
	for (let i = idleWindows.length - 1; i > first; i--) {
		if (idleWindows[i].mean > throttleLimit) {
			last = i;
			break;
		}
	}
	const throttleStartS = idleWindows[Math.max(0, first - 1)].startS;
	const throttleEndS = idleWindows[Math.min(idleWindows.length - 1, last + 1)].endS;
	if (throttleStartS > idleStartS) phases.idle = { startS: idleStartS, endS: throttleStartS };
	else notes.push('The throttle was applied straight after start-up: no idle phase to judge.');
	phases.throttle = { startS: throttleStartS, endS: throttleEndS };
	return { phases, notes };
}

/** The phase a sample time falls in, or undefined between phases. */
export function phaseAt(timeS: number, phases: PhaseBoundaries): StaticPhase | undefined {
	for (const phase of STATIC_PHASES) {
		const span = phases[phase];
		if (span && timeS >= span.startS && timeS < span.endS) return phase;
	}
	return undefined;
}

function weightedMean(windows: readonly DecimatedBucket[]): number {
	let sum = 0;
	let count = 0;
	for (const w of windows) {
		sum += w.mean * w.count;
		count += w.count;
	}
	return sum / count;
}

function median(values: readonly number[]): number {
	if (values.length === 0) return NaN;
	const sorted = [...values].sort((a, b) => a - b);
	const mid = sorted.length >> 1;
	return sorted.length % 2 === 1 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}
