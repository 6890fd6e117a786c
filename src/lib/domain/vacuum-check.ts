/**
 * Vacuum range check of a Δp sensor (common trade practice): vacuum applied to the downstream
 * port equals the differential, so each gauge step has a known Δp and an expected voltage.
 * See docs/method.md, "Vacuum range check".
 */
import {
	assertValidSensor,
	checkCircuit,
	DEFAULT_CIRCUIT_LIMITS,
	DEFAULT_SENSOR,
	makeVerdict,
	mbarToVolts,
	voltsToMbar,
	worseLevel,
	type CircuitLimits,
	type SensorType,
	type Verdict,
	type VerdictLevel
} from './sensor';
import { fitOls } from './stats/ols';
import { toMbar, type PressureUnit } from './units';

/** One step: vacuum read off the gauge and the signal voltage measured at it. */
export interface VacuumStep {
	/** Vacuum applied, as read off the gauge (≥ 0). */
	applied: number;
	unit: PressureUnit;
	measuredVolts: number;
}

/** Tolerances; all Sootcast defaults unless a line says otherwise. */
export interface VacuumCheckTolerances {
	/** Largest allowed |error| per step, % of full scale. */
	maxStepErrorPercentFs: number;
	/** Least R² of the volts-against-Δp fit. */
	minRSquared: number;
	/** Largest allowed deviation of the fitted slope from the nominal, %. */
	maxSlopeErrorPercent: number;
	/** Largest allowed fit residual, % of the voltage span. */
	maxResidualPercentSpan: number;
	/** The highest in-range step must reach this % of full scale to show the upper range. */
	minCoveragePercentFs: number;
	/** A step at or beyond full scale must read at least fullScaleVolts minus this, V. */
	upperRangeToleranceVolts: number;
	/** Fewest in-range steps for the linearity fit. */
	minSteps: number;
	circuit: CircuitLimits;
}

/**
 * Sootcast defaults, no published source. 3 % of full scale is, from memory, the order of the
 * accuracy automotive pressure sensors are specified to; confirm against the maker's sheet.
 */
export const DEFAULT_VACUUM_TOLERANCES: Readonly<VacuumCheckTolerances> = Object.freeze({
	maxStepErrorPercentFs: 3,
	minRSquared: 0.995,
	maxSlopeErrorPercent: 5,
	maxResidualPercentSpan: 2,
	minCoveragePercentFs: 75,
	upperRangeToleranceVolts: 0.15,
	minSteps: 3,
	// From memory (DOMAIN.md): 0.25 V and 4.75 V
	circuit: DEFAULT_CIRCUIT_LIMITS
});

export interface VacuumStepResult {
	appliedMbar: number;
	expectedVolts: number;
	measuredVolts: number;
	/** Δp the sensor's voltage stands for, mbar. */
	measuredMbar: number;
	errorVolts: number;
	errorMbar: number;
	errorPercentFs: number;
	/** Applied Δp at or beyond full scale: judged for saturation, not fitted. */
	beyondFullScale: boolean;
	verdict: Verdict;
}

export interface VacuumFit {
	/** Fitted volts per mbar, and the transfer function's nominal. */
	slopeVoltsPerMbar: number;
	nominalSlopeVoltsPerMbar: number;
	slopeErrorPercent: number;
	/** Fitted volts at 0 mbar. */
	interceptVolts: number;
	rSquared: number;
	maxResidualVolts: number;
	n: number;
}

export type VacuumCheckName = 'circuit' | 'steps' | 'linearity' | 'upper-range';

export interface VacuumCheck extends Verdict {
	check: VacuumCheckName;
}

export interface VacuumCheckReport {
	steps: VacuumStepResult[];
	fit: VacuumFit | undefined;
	reachesUpperRange: boolean;
	checks: VacuumCheck[];
	overall: Verdict;
	passed: boolean;
}

/**
 * Judges a vacuum range check.
 * Per step: applied Δp = vacuum (converted with NIST SP 811 App. B.8 factors), expected volts
 * from the transfer function, error in V, mbar and % of full scale. Linearity: OLS of measured
 * volts against applied Δp over the in-range steps (slope, intercept, R², max residual).
 * @param steps gauge steps in any order
 */
export function runVacuumCheck(
	steps: readonly VacuumStep[],
	sensor: SensorType = DEFAULT_SENSOR,
	tolerances: Partial<VacuumCheckTolerances> = {}
): VacuumCheckReport {
	assertValidSensor(sensor);
	const tol = { ...DEFAULT_VACUUM_TOLERANCES, ...tolerances };
	const results = steps
		.map((step) => judgeStep(step, sensor, tol))
		.sort((a, b) => a.appliedMbar - b.appliedMbar);
	const inRange = results.filter((r) => !r.beyondFullScale);
	const fit = fitSteps(inRange, sensor);
	const upper = judgeUpperRange(results, sensor, tol);
	const voltages = results.map((r) => r.measuredVolts);
	const checks: VacuumCheck[] = [
		{
			check: 'circuit',
			...(voltages.length > 0
				? checkCircuit(Math.min(...voltages), Math.max(...voltages), tol.circuit)
				: makeVerdict('incomplete', 'No steps recorded.'))
		},
		{ check: 'steps', ...judgeSteps(results, tol) },
		{ check: 'linearity', ...judgeLinearity(fit, inRange.length, sensor, tol) },
		{ check: 'upper-range', ...upper.verdict }
	];
	let level: VerdictLevel = 'good';
	for (const c of checks) level = worseLevel(level, c.level);
	const passed = checks.every((c) => c.ok);
	const overall = passed
		? makeVerdict(level, 'The sensor follows its transfer function across the range.')
		: makeVerdict(
				level,
				checks
					.filter((c) => !c.ok)
					.map((c) => c.reason)
					.join(' ')
			);
	return { steps: results, fit, reachesUpperRange: upper.reached, checks, overall, passed };
}

function judgeStep(
	step: VacuumStep,
	sensor: SensorType,
	tol: VacuumCheckTolerances
): VacuumStepResult {
	if (!Number.isFinite(step.applied) || step.applied < 0 || !Number.isFinite(step.measuredVolts)) {
		throw new RangeError(
			`Each vacuum step needs a vacuum of 0 or more and a measured voltage, got ${step.applied} ${step.unit} at ${step.measuredVolts} V`
		);
	}
	const appliedMbar = toMbar(step.applied, step.unit);
	const expectedVolts = mbarToVolts(appliedMbar, sensor);
	const measuredMbar = voltsToMbar(step.measuredVolts, sensor);
	const errorMbar = measuredMbar - appliedMbar;
	const errorPercentFs = (errorMbar / sensor.fullScaleMbar) * 100;
	const beyondFullScale = appliedMbar >= sensor.fullScaleMbar;
	const at = `At ${appliedMbar.toFixed(0)} mbar (${step.applied} ${step.unit})`;
	let verdict: Verdict;
	if (beyondFullScale) {
		const floorVolts = sensor.fullScaleVolts - tol.upperRangeToleranceVolts;
		verdict =
			step.measuredVolts >= floorVolts
				? makeVerdict(
						'good',
						`${at}, beyond full scale, the sensor reads ${v(step.measuredVolts)}: it reaches its upper range.`
					)
				: makeVerdict(
						'fault',
						`${at}, beyond full scale, the sensor reads only ${v(step.measuredVolts)}, below ${v(floorVolts)}: it does not reach its upper range.`
					);
	} else if (Math.abs(errorPercentFs) <= tol.maxStepErrorPercentFs) {
		verdict = makeVerdict(
			'good',
			`${at} the sensor reads ${v(step.measuredVolts)}, expected ${v(expectedVolts)} (${signed(errorPercentFs)} % of full scale).`
		);
	} else {
		verdict = makeVerdict(
			'fault',
			`${at} the sensor reads ${v(step.measuredVolts)}, expected ${v(expectedVolts)}: off by ${signed(errorMbar)} mbar ` +
				`(${signed(errorPercentFs)} % of full scale, more than ±${tol.maxStepErrorPercentFs} %).`
		);
	}
	return {
		appliedMbar,
		expectedVolts,
		measuredVolts: step.measuredVolts,
		measuredMbar,
		errorVolts: step.measuredVolts - expectedVolts,
		errorMbar,
		errorPercentFs,
		beyondFullScale,
		verdict
	};
}

function fitSteps(inRange: VacuumStepResult[], sensor: SensorType): VacuumFit | undefined {
	const xs = inRange.map((r) => r.appliedMbar);
	const ys = inRange.map((r) => r.measuredVolts);
	if (xs.length < 2 || Math.min(...xs) === Math.max(...xs)) return undefined;
	const fit = fitOls(xs, ys);
	const nominal = (sensor.fullScaleVolts - sensor.zeroVolts) / sensor.fullScaleMbar;
	let maxResidualVolts = 0;
	for (let i = 0; i < xs.length; i++) {
		const residual = Math.abs(ys[i] - (fit.intercept + fit.slope * xs[i]));
		if (residual > maxResidualVolts) maxResidualVolts = residual;
	}
	return {
		slopeVoltsPerMbar: fit.slope,
		nominalSlopeVoltsPerMbar: nominal,
		slopeErrorPercent: ((fit.slope - nominal) / nominal) * 100,
		interceptVolts: fit.intercept,
		rSquared: fit.rSquared,
		maxResidualVolts,
		n: fit.n
	};
}

function judgeSteps(results: VacuumStepResult[], tol: VacuumCheckTolerances): Verdict {
	if (results.length === 0) return makeVerdict('incomplete', 'No steps recorded.');
	const failing = results.filter((r) => !r.verdict.ok);
	if (failing.length === 0) {
		return makeVerdict(
			'good',
			`All ${results.length} steps read within ±${tol.maxStepErrorPercentFs} % of full scale of the transfer function.`
		);
	}
	return makeVerdict('fault', failing.map((r) => r.verdict.reason).join(' '));
}

function judgeLinearity(
	fit: VacuumFit | undefined,
	inRangeCount: number,
	sensor: SensorType,
	tol: VacuumCheckTolerances
): Verdict {
	if (!fit || inRangeCount < tol.minSteps) {
		return makeVerdict(
			'incomplete',
			`Linearity not judged: at least ${tol.minSteps} steps at different vacuums within the sensor's range are needed, got ${inRangeCount}.`
		);
	}
	const maxResidualVolts =
		(tol.maxResidualPercentSpan / 100) * (sensor.fullScaleVolts - sensor.zeroVolts);
	const figures =
		`slope ${(fit.slopeVoltsPerMbar * 1000).toFixed(3)} V per bar (nominal ${(fit.nominalSlopeVoltsPerMbar * 1000).toFixed(3)}), ` +
		`R² ${fit.rSquared.toFixed(4)}, largest residual ${v(fit.maxResidualVolts)}`;
	const problems: string[] = [];
	if (fit.rSquared < tol.minRSquared) problems.push(`R² is below ${tol.minRSquared}`);
	if (Math.abs(fit.slopeErrorPercent) > tol.maxSlopeErrorPercent) {
		problems.push(
			`the slope is ${signed(fit.slopeErrorPercent)} % off nominal (±${tol.maxSlopeErrorPercent} % allowed)`
		);
	}
	if (fit.maxResidualVolts > maxResidualVolts)
		problems.push(`a residual exceeds ${v(maxResidualVolts)}`);
	if (problems.length === 0) return makeVerdict('good', `The response is linear: ${figures}.`);
	return makeVerdict(
		'fault',
		`The response is not linear enough: ${problems.join('; ')} (${figures}).`
	);
}

function judgeUpperRange(
	results: VacuumStepResult[],
	sensor: SensorType,
	tol: VacuumCheckTolerances
): { reached: boolean; verdict: Verdict } {
	const beyond = results.filter((r) => r.beyondFullScale);
	const coverageMbar = (tol.minCoveragePercentFs / 100) * sensor.fullScaleMbar;
	const high = results.filter((r) => !r.beyondFullScale && r.appliedMbar >= coverageMbar);
	if (beyond.length > 0) {
		const reached = beyond.every((r) => r.verdict.ok);
		return {
			reached,
			verdict: reached
				? makeVerdict(
						'good',
						`At or beyond full scale the sensor reads close to its ${v(sensor.fullScaleVolts)} full-scale voltage.`
					)
				: makeVerdict(
						'fault',
						`At or beyond full scale the sensor stays below ${v(sensor.fullScaleVolts - tol.upperRangeToleranceVolts)}: it does not reach its upper range.`
					)
		};
	}
	if (high.length === 0) {
		const top = results.length > 0 ? results[results.length - 1].appliedMbar : 0;
		return {
			reached: false,
			verdict: makeVerdict(
				'incomplete',
				`Upper range not shown: the highest step is ${top.toFixed(0)} mbar; apply at least ${coverageMbar.toFixed(0)} mbar ` +
					`(${tol.minCoveragePercentFs} % of the ${sensor.fullScaleMbar} mbar full scale).`
			)
		};
	}
	const reached = high.every((r) => r.verdict.ok);
	const top = high[high.length - 1];
	return {
		reached,
		verdict: reached
			? makeVerdict(
					'good',
					`At ${top.appliedMbar.toFixed(0)} mbar the sensor reads ${v(top.measuredVolts)}, on its transfer function near full scale.`
				)
			: makeVerdict(
					'fault',
					`Near full scale the sensor falls short of its transfer function (${v(top.measuredVolts)} at ${top.appliedMbar.toFixed(0)} mbar, expected ${v(top.expectedVolts)}).`
				)
	};
}

function v(volts: number): string {
	return `${volts.toFixed(2)} V`;
}

function signed(value: number): string {
	const text = value.toFixed(1);
	return value > 0 ? `+${text}` : text;
}
