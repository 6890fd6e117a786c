/**
 * Exhaust pulsation in a Δp signal, measured in constant memory. The trace is not a straight
 * line: each exhaust stroke pushes a pulse through the filter. Pulsation is the spread of the
 * signal around its local mean; the local mean (what soot raises) is tracked separately.
 */

/** Tuning of the pulsation meter. */
export interface PulsationOptions {
	/**
	 * Time constant of the local mean, s. Must be long against one exhaust pulse (a 4-cylinder
	 * four-stroke at 800 rpm fires at about 27 Hz, 37 ms) and short against a throttle blip.
	 */
	localMeanTauS: number;
	/** Histogram bin width for residuals, V; sets the resolution of the percentiles. */
	binVolts: number;
	/** Residuals beyond ±rangeVolts land in the end bins. */
	rangeVolts: number;
	/** Lower and upper percentile (0–1) whose difference is the pulsation amplitude. */
	lowQuantile: number;
	highQuantile: number;
}

/**
 * Sootcast defaults, no published source: τ = 0.1 s attenuates a 27 Hz pulse to about 6 % in
 * the local mean; 1 mV bins are 0.25 mbar on a 0–1000 mbar sensor; p5–p95 ignores spikes.
 */
export const DEFAULT_PULSATION: Readonly<PulsationOptions> = Object.freeze({
	localMeanTauS: 0.1,
	binVolts: 0.001,
	rangeVolts: 5,
	lowQuantile: 0.05,
	highQuantile: 0.95
});

/**
 * Streams samples and reports the p95 − p5 spread of (signal − local mean), where the local
 * mean is an exponential moving average with time constant τ. Memory: one fixed histogram.
 * Limitation: the moving average lags a ramp by about slope × τ, so a fast throttle ramp adds
 * a little to the throttle phase's pulsation.
 */
export class PulsationMeter {
	private readonly options: PulsationOptions;
	private readonly bins: Uint32Array;
	private readonly offset: number;
	private localMean = NaN;
	private lastTimeS = NaN;
	private lastDtS = NaN;
	private lastAlpha = 0;
	private total = 0;

	constructor(options: Partial<PulsationOptions> = {}) {
		this.options = { ...DEFAULT_PULSATION, ...options };
		if (!(this.options.binVolts > 0) || !(this.options.rangeVolts > 0)) {
			throw new RangeError('Pulsation bin width and range must be positive');
		}
		this.offset = Math.round(this.options.rangeVolts / this.options.binVolts);
		this.bins = new Uint32Array(2 * this.offset + 1);
	}

	/** Adds one sample; times must not decrease. */
	add(timeS: number, volts: number): void {
		if (this.total === 0) {
			this.localMean = volts;
		} else {
			const dtS = timeS - this.lastTimeS;
			// Captures are usually evenly sampled: reuse the last smoothing factor to skip exp()
			if (dtS !== this.lastDtS) {
				this.lastDtS = dtS;
				this.lastAlpha = 1 - Math.exp(-dtS / this.options.localMeanTauS);
			}
			this.localMean += this.lastAlpha * (volts - this.localMean);
		}
		this.lastTimeS = timeS;
		let index = Math.round((volts - this.localMean) / this.options.binVolts) + this.offset;
		if (index < 0) index = 0;
		else if (index >= this.bins.length) index = this.bins.length - 1;
		this.bins[index] += 1;
		this.total += 1;
	}

	/** Samples seen so far. */
	get count(): number {
		return this.total;
	}

	/** Residual (signal − local mean) at quantile q in 0–1, V; NaN when empty. */
	residualQuantile(q: number): number {
		if (this.total === 0) return NaN;
		const target = Math.max(1, Math.ceil(q * this.total));
		let seen = 0;
		for (let i = 0; i < this.bins.length; i++) {
			seen += this.bins[i];
			if (seen >= target) return (i - this.offset) * this.options.binVolts;
		}
		return (this.bins.length - 1 - this.offset) * this.options.binVolts;
	}

	/** Pulsation amplitude, V: high-quantile minus low-quantile residual (p95 − p5 by default). */
	amplitudeVolts(): number {
		return (
			this.residualQuantile(this.options.highQuantile) -
			this.residualQuantile(this.options.lowQuantile)
		);
	}
}
