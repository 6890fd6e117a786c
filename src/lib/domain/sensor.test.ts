import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	assertValidSensor,
	checkCircuit,
	checkEngineOffZero,
	DEFAULT_CIRCUIT_LIMITS,
	DEFAULT_SENSOR,
	makeVerdict,
	mbarPerVolt,
	mbarToVolts,
	voltsToMbar,
	worseLevel,
	type SensorType
} from './sensor';

describe('transfer function', () => {
	it('defaults to a 0.5–4.5 V, 0–1000 mbar sensor', () => {
		// check value: common trade practice, no published source (0.5 V at zero, 4.5 V at full scale)
		expect(DEFAULT_SENSOR).toEqual({ zeroVolts: 0.5, fullScaleVolts: 4.5, fullScaleMbar: 1000 });
	});

	it('reads 2.5 V as 500 mbar on a 0–1000 mbar sensor, and back', () => {
		// check value: common trade practice, no published source
		expect(voltsToMbar(2.5)).toBeCloseTo(500, 12);
		// check value: common trade practice, no published source
		expect(mbarToVolts(500)).toBeCloseTo(2.5, 12);
	});

	it('puts zero and full scale at the ends of the voltage span', () => {
		// check value: common trade practice, no published source (0.5 V ↔ 0 mbar, 4.5 V ↔ 1000 mbar)
		expect(voltsToMbar(0.5)).toBe(0);
		expect(voltsToMbar(4.5)).toBeCloseTo(1000, 12);
		// DOMAIN.md formula by hand: (1.0 − 0.5) × 1000 / (4.5 − 0.5) = 125 mbar
		expect(voltsToMbar(1.0)).toBeCloseTo(125, 12);
	});

	it('follows a sensor of another range', () => {
		const sensor: SensorType = { zeroVolts: 1, fullScaleVolts: 4, fullScaleMbar: 600 };
		// DOMAIN.md formula by hand: (2.5 − 1) × 600 / (4 − 1) = 300 mbar
		expect(voltsToMbar(2.5, sensor)).toBeCloseTo(300, 12);
		expect(mbarPerVolt(sensor)).toBeCloseTo(200, 12);
		expect(voltsToMbar(0.7, sensor)).toBeCloseTo(-60, 12);
	});

	const sensor = fc
		.record({
			zeroVolts: fc.double({ min: 0, max: 2, noNaN: true }),
			spanVolts: fc.double({ min: 0.5, max: 4.5, noNaN: true }),
			fullScaleMbar: fc.double({ min: 50, max: 10_000, noNaN: true })
		})
		.map(({ zeroVolts, spanVolts, fullScaleMbar }) => ({
			zeroVolts,
			fullScaleVolts: zeroVolts + spanVolts,
			fullScaleMbar
		}));

	it('inverts exactly: voltsToMbar after mbarToVolts is the identity', () => {
		fc.assert(
			fc.property(sensor, fc.double({ min: -2000, max: 12_000, noNaN: true }), (s, mbar) => {
				expect(voltsToMbar(mbarToVolts(mbar, s), s)).toBeCloseTo(mbar, 6);
			})
		);
	});

	it('inverts exactly: mbarToVolts after voltsToMbar is the identity', () => {
		fc.assert(
			fc.property(sensor, fc.double({ min: 0, max: 5, noNaN: true }), (s, volts) => {
				expect(mbarToVolts(voltsToMbar(volts, s), s)).toBeCloseTo(volts, 9);
			})
		);
	});

	it('rejects a sensor whose full-scale voltage is not above its zero', () => {
		expect(() =>
			assertValidSensor({ zeroVolts: 4.5, fullScaleVolts: 0.5, fullScaleMbar: 1000 })
		).toThrow(/must be above its zero voltage/);
		expect(() =>
			assertValidSensor({ zeroVolts: 0.5, fullScaleVolts: 4.5, fullScaleMbar: 0 })
		).toThrow(/above 0 mbar/);
		expect(() => assertValidSensor(DEFAULT_SENSOR)).not.toThrow();
	});
});

describe('checkCircuit', () => {
	it('uses 0.25 V and 4.75 V as default limits', () => {
		// check value: from memory (DOMAIN.md, "thresholds from memory"), to be confirmed
		expect(DEFAULT_CIRCUIT_LIMITS).toEqual({ minVolts: 0.25, maxVolts: 4.75 });
	});

	it('passes a signal inside the band', () => {
		const verdict = checkCircuit(0.48, 4.6);
		expect(verdict).toMatchObject({ ok: true, level: 'good' });
	});

	it('calls a signal below the band a circuit fault and says which way', () => {
		const verdict = checkCircuit(0.1, 0.5);
		expect(verdict).toMatchObject({ ok: false, level: 'fault' });
		expect(verdict.reason).toContain('0.10 V');
		expect(verdict.reason).toContain('below the 0.25 V');
	});

	it('calls a signal above the band a circuit fault', () => {
		const verdict = checkCircuit(0.5, 4.9);
		expect(verdict.level).toBe('fault');
		expect(verdict.reason).toContain('above the 4.75 V');
	});

	it('takes its limits from the caller', () => {
		expect(checkCircuit(0.3, 0.3, { minVolts: 0.4, maxVolts: 4.6 }).level).toBe('fault');
		expect(checkCircuit(0.3, 0.3).level).toBe('good');
	});
});

describe('checkEngineOffZero', () => {
	it('passes a signal at the sensor zero', () => {
		expect(checkEngineOffZero(0.5)).toMatchObject({ ok: true, level: 'good' });
	});

	it('passes a sensor resting slightly high', () => {
		// DOMAIN.md: "a few sit slightly higher" than 0.5 V with the engine off
		const verdict = checkEngineOffZero(0.56);
		expect(verdict.ok).toBe(true);
		expect(verdict.reason).toContain('within 0.10 V');
	});

	it('fails an offset beyond the tolerance and names its size', () => {
		const verdict = checkEngineOffZero(0.75);
		expect(verdict).toMatchObject({ ok: false, level: 'fault' });
		// 0.25 V × 250 mbar/V = 62.5 mbar offset (DOMAIN.md transfer function by hand)
		expect(verdict.reason).toContain('0.25 V (63 mbar) above');
	});

	it('reports a circuit fault before a zero offset', () => {
		const verdict = checkEngineOffZero(0.1);
		expect(verdict.level).toBe('fault');
		expect(verdict.reason).toContain('circuit limit');
	});

	it('uses the sensor zero and tolerance it is given', () => {
		const sensor: SensorType = { zeroVolts: 1, fullScaleVolts: 4, fullScaleMbar: 600 };
		expect(checkEngineOffZero(1.05, sensor).ok).toBe(true);
		expect(checkEngineOffZero(0.5, sensor).ok).toBe(false);
		expect(checkEngineOffZero(1.05, sensor, { toleranceVolts: 0.02 }).ok).toBe(false);
	});
});

describe('verdicts', () => {
	it('are ok exactly for good and acceptable', () => {
		expect(makeVerdict('good', 'x').ok).toBe(true);
		expect(makeVerdict('acceptable', 'x').ok).toBe(true);
		expect(makeVerdict('incomplete', 'x').ok).toBe(false);
		expect(makeVerdict('concern', 'x').ok).toBe(false);
		expect(makeVerdict('fault', 'x').ok).toBe(false);
	});

	it('rank fault worst and good best', () => {
		expect(worseLevel('good', 'fault')).toBe('fault');
		expect(worseLevel('concern', 'acceptable')).toBe('concern');
		expect(worseLevel('incomplete', 'concern')).toBe('concern');
		expect(worseLevel('acceptable', 'good')).toBe('acceptable');
	});
});
