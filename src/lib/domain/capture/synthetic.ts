/**
 * Synthetic static-test captures with known truth, for tests, benchmarks and demonstrations:
 * engine off → crank/start → idle → throttle blip → idle again. The Δp level follows the
 * phase; exhaust pulsation is a sinusoid around that level (so the phase mean is the level),
 * plus seeded Gaussian noise. A model for exercising the code, not an engine simulation.
 */
import { createRandom } from '../stats/random';
import { DEFAULT_SENSOR, mbarToVolts, type SensorType } from '../sensor';
import type { PhaseBoundaries } from './phases';

export interface SyntheticStaticTestSpec {
	sampleRateHz: number;
	sensor: SensorType;
	engineOffS: number;
	startS: number;
	idleS: number;
	/** Throttle phase: ramp up, hold, ramp down, each a third. */
	throttleS: number;
	/** Idle after the blip (belongs to no judged phase). */
	tailS: number;
	/** Engine-off signal, V (a sensor may rest slightly off its nominal zero). */
	engineOffVolts: number;
	/** Mean Δp during start-up, mbar above the engine-off level. */
	startRiseMbar: number;
	/** Mean Δp at idle and at the top of the throttle blip, mbar above engine off. */
	idleMbar: number;
	throttleMbar: number;
	/** Pulsation peak-to-peak at idle, mbar; doubles at the top of the throttle blip. */
	idlePulsationMbar: number;
	/** Firing frequency at idle, Hz; three times higher at the top of the throttle blip. */
	idlePulseHz: number;
	/** Standard deviation of electrical noise, V. */
	noiseVolts: number;
	seed: number;
}

/** A healthy van: idle 18 mbar, throttle blip 80 mbar (0.82 V mean). Illustrative values. */
export const HEALTHY_SPEC: Readonly<SyntheticStaticTestSpec> = Object.freeze({
	sampleRateHz: 2000,
	sensor: DEFAULT_SENSOR,
	engineOffS: 3,
	startS: 3,
	idleS: 8,
	throttleS: 3,
	tailS: 3,
	engineOffVolts: 0.5,
	startRiseMbar: 8,
	idleMbar: 18,
	throttleMbar: 80,
	idlePulsationMbar: 16,
	idlePulseHz: 27,
	noiseVolts: 0.002,
	seed: 1
});

export interface SyntheticCapture {
	timesS: Float64Array;
	volts: Float64Array;
	/** The spans the generator used for each judged phase. */
	truth: Required<PhaseBoundaries>;
}

/** Phase spans of a spec, s. */
export function syntheticPhases(spec: SyntheticStaticTestSpec): Required<PhaseBoundaries> {
	const startS = spec.engineOffS;
	const idleS = startS + spec.startS;
	const throttleS = idleS + spec.idleS;
	return {
		ignitionOn: { startS: 0, endS: startS },
		start: { startS, endS: idleS },
		idle: { startS: idleS, endS: throttleS },
		throttle: { startS: throttleS, endS: throttleS + spec.throttleS }
	};
}

/** Total length of a spec's capture, s. */
export function syntheticDurationS(spec: SyntheticStaticTestSpec): number {
	return spec.engineOffS + spec.startS + spec.idleS + spec.throttleS + spec.tailS;
}

/**
 * The noise-free signal at time t, V: level plus pulsation. Pulse phase is integrated from
 * the frequency profile so the waveform stays continuous through the blip.
 */
export function createSyntheticSignal(spec: SyntheticStaticTestSpec): (timeS: number) => number {
	const p = syntheticPhases(spec);
	let phaseRad = 0;
	let lastS = 0;
	return (timeS: number): number => {
		const { levelMbar, ppMbar, hz } = profileAt(spec, p, timeS);
		phaseRad += 2 * Math.PI * hz * Math.max(0, timeS - lastS);
		lastS = timeS;
		const mbar = levelMbar + (ppMbar / 2) * Math.sin(phaseRad);
		return spec.engineOffVolts + mbarToVolts(mbar, spec.sensor) - spec.sensor.zeroVolts;
	};
}

/** Generates a whole capture in memory with the spec's seeded noise. */
export function generateStaticTestCapture(
	overrides: Partial<SyntheticStaticTestSpec> = {}
): SyntheticCapture {
	const spec = { ...HEALTHY_SPEC, ...overrides };
	const n = Math.round(syntheticDurationS(spec) * spec.sampleRateHz);
	const timesS = new Float64Array(n);
	const volts = new Float64Array(n);
	const signal = createSyntheticSignal(spec);
	const random = createRandom(spec.seed);
	for (let i = 0; i < n; i++) {
		const t = i / spec.sampleRateHz;
		timesS[i] = t;
		volts[i] = signal(t) + spec.noiseVolts * random.normal();
	}
	return { timesS, volts, truth: syntheticPhases(spec) };
}

function profileAt(
	spec: SyntheticStaticTestSpec,
	p: Required<PhaseBoundaries>,
	t: number
): { levelMbar: number; ppMbar: number; hz: number } {
	if (t < p.start.startS) return { levelMbar: 0, ppMbar: 0, hz: 0 };
	if (t < p.idle.startS) {
		// Cranking for the first second: slow, weak pulses; then the engine runs
		const cranking = t < p.start.startS + 1;
		return {
			levelMbar: spec.startRiseMbar,
			ppMbar: cranking ? spec.idlePulsationMbar / 2 : spec.idlePulsationMbar,
			hz: cranking ? spec.idlePulseHz / 4 : spec.idlePulseHz
		};
	}
	const third = spec.throttleS / 3;
	const intoBlip = t - p.throttle.startS;
	let blip = 0;
	if (intoBlip >= 0 && intoBlip < spec.throttleS) {
		blip =
			intoBlip < third
				? intoBlip / third
				: intoBlip < 2 * third
					? 1
					: (spec.throttleS - intoBlip) / third;
	}
	return {
		levelMbar: spec.idleMbar + blip * (spec.throttleMbar - spec.idleMbar),
		ppMbar: spec.idlePulsationMbar * (1 + blip),
		hz: spec.idlePulseHz * (1 + 2 * blip)
	};
}
