/**
 * One pass over a capture in bounded memory: running statistics and pulsation per phase, the
 * whole-capture statistics and the min/max pyramid for the chart. Samples are never stored.
 */
import { STATIC_PHASES, type PhaseBoundaries, type StaticPhase } from './phases';
import { PulsationMeter, type PulsationOptions } from './pulsation';
import { MinMaxPyramid, type PyramidOptions } from './pyramid';
import { addValue, emptyStats, stdDevOf, type RunningStats } from './running-stats';

/** Statistics of the signal over one phase (or the whole capture), all in volts. */
export interface SignalSummary {
	/** Time of the first and last sample seen, s. */
	firstS: number;
	lastS: number;
	count: number;
	meanVolts: number;
	minVolts: number;
	maxVolts: number;
	/** Population standard deviation: noise plus pulsation. */
	stdDevVolts: number;
	/** p95 − p5 of the signal around its local mean (see PulsationMeter); NaN if not measured. */
	pulsationVolts: number;
}

export interface CaptureSummaryResult {
	overall: SignalSummary | undefined;
	phases: Partial<Record<StaticPhase, SignalSummary>>;
}

export interface CaptureSummaryOptions {
	/** Phase spans to summarise separately; none gives the whole-capture summary only. */
	phases: PhaseBoundaries;
	pulsation: Partial<PulsationOptions>;
	/** Pyramid options, or false when no chart data is wanted. */
	pyramid: Partial<PyramidOptions> | false;
}

class PhaseAccumulator {
	readonly stats: RunningStats = emptyStats();
	readonly pulsation: PulsationMeter;
	firstS = NaN;
	lastS = NaN;

	constructor(pulsation: Partial<PulsationOptions>) {
		this.pulsation = new PulsationMeter(pulsation);
	}

	add(timeS: number, volts: number): void {
		if (this.stats.count === 0) this.firstS = timeS;
		this.lastS = timeS;
		addValue(this.stats, volts);
		this.pulsation.add(timeS, volts);
	}

	summary(): SignalSummary | undefined {
		return summarise(this.stats, this.firstS, this.lastS, this.pulsation.amplitudeVolts());
	}
}

/** Accumulates a capture sample by sample; feed it from the parser's callback. */
export class CaptureSummary {
	readonly pyramid: MinMaxPyramid | undefined;
	private readonly perPhase: Partial<Record<StaticPhase, PhaseAccumulator>> = {};
	// Spans as flat arrays, in STATIC_PHASES order: the lookup runs once per sample
	private readonly spanStarts: number[] = [];
	private readonly spanEnds: number[] = [];
	private readonly spanAccumulators: PhaseAccumulator[] = [];
	private readonly overall: RunningStats = emptyStats();
	private firstS = NaN;
	private lastS = NaN;

	constructor(options: Partial<CaptureSummaryOptions> = {}) {
		const phases = options.phases ?? {};
		for (const phase of STATIC_PHASES) {
			const span = phases[phase];
			if (!span) continue;
			if (!(span.endS > span.startS)) {
				throw new RangeError(`The ${phase} phase must end after it starts`);
			}
			const accumulator = new PhaseAccumulator(options.pulsation ?? {});
			this.perPhase[phase] = accumulator;
			this.spanStarts.push(span.startS);
			this.spanEnds.push(span.endS);
			this.spanAccumulators.push(accumulator);
		}
		this.pyramid = options.pyramid === false ? undefined : new MinMaxPyramid(options.pyramid);
	}

	/** Adds one sample: time in s (non-decreasing), signal in V. */
	add(timeS: number, volts: number): void {
		if (this.overall.count === 0) this.firstS = timeS;
		this.lastS = timeS;
		addValue(this.overall, volts);
		this.pyramid?.add(timeS, volts);
		// First matching span wins, as in phaseAt()
		for (let i = 0; i < this.spanStarts.length; i++) {
			if (timeS >= this.spanStarts[i] && timeS < this.spanEnds[i]) {
				this.spanAccumulators[i].add(timeS, volts);
				break;
			}
		}
	}

	/** The summary so far; phases that received no samples are left out. */
	result(): CaptureSummaryResult {
		const phases: Partial<Record<StaticPhase, SignalSummary>> = {};
		for (const phase of STATIC_PHASES) {
			const summary = this.perPhase[phase]?.summary();
			if (summary) phases[phase] = summary;
		}
		return { overall: summarise(this.overall, this.firstS, this.lastS, NaN), phases };
	}
}

/** Summarises samples held in memory (a short capture, or a test). */
export function summariseSamples(
	timesS: ArrayLike<number>,
	volts: ArrayLike<number>,
	options: Partial<CaptureSummaryOptions> = {}
): CaptureSummaryResult {
	if (timesS.length !== volts.length)
		throw new RangeError('Times and volts must have the same length');
	const summary = new CaptureSummary({ pyramid: false, ...options });
	for (let i = 0; i < timesS.length; i++) summary.add(timesS[i], volts[i]);
	return summary.result();
}

function summarise(
	stats: RunningStats,
	firstS: number,
	lastS: number,
	pulsationVolts: number
): SignalSummary | undefined {
	if (stats.count === 0) return undefined;
	return {
		firstS,
		lastS,
		count: stats.count,
		meanVolts: stats.mean,
		minVolts: stats.min,
		maxVolts: stats.max,
		stdDevVolts: stdDevOf(stats),
		pulsationVolts
	};
}
