/**
 * The DPF differential pressure sensor: a three-wire linear sensor whose signal voltage maps to
 * Δp. Transfer function, circuit-fault limits and the engine-off zero check.
 */

/** A sensor's linear transfer function: zeroVolts at 0 mbar, fullScaleVolts at fullScaleMbar. */
export interface SensorType {
	zeroVolts: number;
	fullScaleVolts: number;
	fullScaleMbar: number;
}

/** 0.5 V at 0 mbar, 4.5 V at 1000 mbar: common trade practice, no published source. */
export const DEFAULT_SENSOR: Readonly<SensorType> = Object.freeze({
	zeroVolts: 0.5,
	fullScaleVolts: 4.5,
	fullScaleMbar: 1000
});

/** How Sootcast grades a check, best first. 'incomplete' means the data could not be judged. */
export type VerdictLevel = 'good' | 'acceptable' | 'incomplete' | 'concern' | 'fault';

/** A judgement with its reason in plain English. `ok` is true for 'good' and 'acceptable'. */
export interface Verdict {
	ok: boolean;
	level: VerdictLevel;
	reason: string;
}

const LEVEL_RANK: Readonly<Record<VerdictLevel, number>> = {
	good: 0,
	acceptable: 1,
	incomplete: 2,
	concern: 3,
	fault: 4
};

/** Builds a verdict; `ok` follows from the level so the two can never disagree. */
export function makeVerdict(level: VerdictLevel, reason: string): Verdict {
	return { ok: level === 'good' || level === 'acceptable', level, reason };
}

/** The worse of two levels ('fault' is worst). */
export function worseLevel(a: VerdictLevel, b: VerdictLevel): VerdictLevel {
	return LEVEL_RANK[a] >= LEVEL_RANK[b] ? a : b;
}

/** Throws a RangeError unless the sensor's numbers describe a usable rising transfer function. */
export function assertValidSensor(sensor: SensorType): void {
	const { zeroVolts, fullScaleVolts, fullScaleMbar } = sensor;
	if (![zeroVolts, fullScaleVolts, fullScaleMbar].every(Number.isFinite)) {
		throw new RangeError('Sensor zero volts, full-scale volts and full-scale mbar must be numbers');
	}
	if (fullScaleVolts <= zeroVolts) {
		throw new RangeError(
			`Sensor full-scale voltage (${fullScaleVolts} V) must be above its zero voltage (${zeroVolts} V)`
		);
	}
	if (fullScaleMbar <= 0) {
		throw new RangeError(`Sensor full scale must be above 0 mbar, got ${fullScaleMbar} mbar`);
	}
}

/** Slope of the transfer function in mbar per volt (250 mbar/V for the default sensor). */
export function mbarPerVolt(sensor: SensorType = DEFAULT_SENSOR): number {
	return sensor.fullScaleMbar / (sensor.fullScaleVolts - sensor.zeroVolts);
}

/**
 * Signal voltage → Δp, `Δp = (V − V0) × FS / (Vfs − V0)` (DOMAIN.md; common trade practice).
 * @param volts signal voltage, V (not clamped: readings beyond full scale extrapolate)
 * @returns Δp in mbar; negative below the zero voltage
 */
export function voltsToMbar(volts: number, sensor: SensorType = DEFAULT_SENSOR): number {
	return (volts - sensor.zeroVolts) * mbarPerVolt(sensor);
}

/**
 * Δp → signal voltage, the inverse of {@link voltsToMbar}: `V = V0 + Δp × (Vfs − V0) / FS`.
 * @param mbar differential pressure, mbar
 * @returns expected signal voltage, V
 */
export function mbarToVolts(mbar: number, sensor: SensorType = DEFAULT_SENSOR): number {
	return sensor.zeroVolts + mbar / mbarPerVolt(sensor);
}

/**
 * Signal voltages outside this band mean a wiring or circuit fault (open circuit, short to
 * ground or to the 5 V supply) rather than a pressure.
 */
export interface CircuitLimits {
	minVolts: number;
	maxVolts: number;
}

/** 0.25 V and 4.75 V: values from memory (DOMAIN.md), to be confirmed per sensor maker. */
export const DEFAULT_CIRCUIT_LIMITS: Readonly<CircuitLimits> = Object.freeze({
	minVolts: 0.25,
	maxVolts: 4.75
});

/**
 * Checks signal voltages against the circuit-fault band.
 * @param minVolts lowest signal seen, V
 * @param maxVolts highest signal seen, V (pass the same value twice for a single reading)
 * @returns 'fault' when either lies outside the band, else 'good'
 */
export function checkCircuit(
	minVolts: number,
	maxVolts: number = minVolts,
	limits: CircuitLimits = DEFAULT_CIRCUIT_LIMITS
): Verdict {
	if (!Number.isFinite(minVolts) || !Number.isFinite(maxVolts)) {
		return makeVerdict('incomplete', 'No signal voltage to check.');
	}
	if (minVolts < limits.minVolts) {
		return makeVerdict(
			'fault',
			`Signal fell to ${volts(minVolts)}, below the ${volts(limits.minVolts)} circuit limit: ` +
				'check the signal wire and the 5 V supply for an open circuit or a short to ground.'
		);
	}
	if (maxVolts > limits.maxVolts) {
		return makeVerdict(
			'fault',
			`Signal rose to ${volts(maxVolts)}, above the ${volts(limits.maxVolts)} circuit limit: ` +
				'check for a short to the 5 V supply or a broken ground wire.'
		);
	}
	return makeVerdict(
		'good',
		`Signal stayed between ${volts(limits.minVolts)} and ${volts(limits.maxVolts)}: no circuit fault.`
	);
}

/** Options for the engine-off zero check. */
export interface ZeroCheckOptions {
	/** Largest allowed |mean − zeroVolts|, V. */
	toleranceVolts: number;
	circuit: CircuitLimits;
}

/**
 * 0.1 V (25 mbar on a 0–1000 mbar sensor): Sootcast default, no published source. DOMAIN.md
 * notes a few sensors rest slightly above their nominal zero; 0.1 V admits those.
 */
export const DEFAULT_ZERO_CHECK: Readonly<ZeroCheckOptions> = Object.freeze({
	toleranceVolts: 0.1,
	circuit: DEFAULT_CIRCUIT_LIMITS
});

/**
 * Engine stopped, ignition on: the signal should sit at the sensor's zero voltage.
 * @param meanVolts mean signal with the engine off, V
 * @param sensor transfer function whose zeroVolts is expected
 * @returns 'fault' for a circuit fault or a zero offset beyond tolerance, else 'good'
 */
export function checkEngineOffZero(
	meanVolts: number,
	sensor: SensorType = DEFAULT_SENSOR,
	options: Partial<ZeroCheckOptions> = {}
): Verdict {
	const { toleranceVolts, circuit } = { ...DEFAULT_ZERO_CHECK, ...options };
	const circuitVerdict = checkCircuit(meanVolts, meanVolts, circuit);
	if (circuitVerdict.level !== 'good') return circuitVerdict;
	const offsetVolts = meanVolts - sensor.zeroVolts;
	const offsetMbar = offsetVolts * mbarPerVolt(sensor);
	if (Math.abs(offsetVolts) <= toleranceVolts) {
		return makeVerdict(
			'good',
			`Engine-off signal ${volts(meanVolts)} is within ${volts(toleranceVolts)} of the ` +
				`sensor's ${volts(sensor.zeroVolts)} zero.`
		);
	}
	const direction = offsetVolts > 0 ? 'above' : 'below';
	return makeVerdict(
		'fault',
		`Engine-off signal ${volts(meanVolts)} is ${volts(Math.abs(offsetVolts))} ` +
			`(${Math.abs(offsetMbar).toFixed(0)} mbar) ${direction} the sensor's ${volts(sensor.zeroVolts)} ` +
			`zero, more than the ${volts(toleranceVolts)} allowed: check the sensor type, its supply ` +
			'and that the engine was really off; readings from this sensor would be offset.'
	);
}

function volts(value: number): string {
	return `${value.toFixed(2)} V`;
}
