import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	convertPressure,
	formatPressure,
	fromMbar,
	isPressureUnit,
	PASCALS_PER_UNIT,
	PRESSURE_UNITS,
	toMbar,
	type PressureUnit
} from './units';

/** |a − b| ≤ rel·|b|: SP 811 prints 7 significant digits, so compare relatively. */
function expectRelClose(actual: number, expected: number, rel = 1e-6): void {
	expect(Math.abs(actual - expected)).toBeLessThanOrEqual(rel * Math.abs(expected));
}

describe('pascals per unit', () => {
	it('uses the NIST SP 811 Appendix B.8 factors', () => {
		expect(PASCALS_PER_UNIT.mbar).toBe(1.0e2); // NIST SP 811 App. B.8: millibar 1.0 E+02 (exact)
		expect(PASCALS_PER_UNIT.hPa).toBe(1.0e2); // SI prefix hecto: 1 hPa = 100 Pa (exact)
		expect(PASCALS_PER_UNIT.kPa).toBe(1.0e3); // SI prefix kilo: 1 kPa = 1000 Pa (exact)
		expect(PASCALS_PER_UNIT.psi).toBe(6.894757e3); // NIST SP 811 App. B.8: psi 6.894 757 E+03
		expect(PASCALS_PER_UNIT.inHg).toBe(3.386389e3); // NIST SP 811 App. B.8: inHg, conventional 3.386 389 E+03
		expect(PASCALS_PER_UNIT.inH2O).toBe(2.490889e2); // NIST SP 811 App. B.8: inH2O, conventional 2.490 889 E+02
	});

	it('agrees with the physical definitions of the conventional units', () => {
		// units.md [P]: 1 in × 1000 kg/m³ × gₙ = 0.0254 × 1000 × 9.80665 = 249.088 91 Pa
		expectRelClose(PASCALS_PER_UNIT.inH2O, 0.0254 * 1000 * 9.80665, 1e-7);
		// units.md: psi exact from definitions 0.453 592 37 kg × 9.806 65 / 0.0254² = 6894.757 293 168 Pa
		expectRelClose(PASCALS_PER_UNIT.psi, (0.45359237 * 9.80665) / 0.0254 ** 2, 1e-7);
		// units.md [P]: 0.0254 × 13 595.1 kg/m³ × gₙ = 3386.388 640 Pa
		expectRelClose(PASCALS_PER_UNIT.inHg, 0.0254 * 13595.1 * 9.80665, 1e-6);
	});

	it('covers every unit in the stored vocabulary', () => {
		for (const unit of PRESSURE_UNITS) expect(PASCALS_PER_UNIT[unit]).toBeGreaterThan(0);
	});
});

describe('convertPressure', () => {
	it('matches the derived conversion table in units.md (NIST SP 811 App. B.8)', () => {
		expectRelClose(toMbar(1, 'inHg'), 33.86389); // NIST SP 811 App. B.8, units.md derived table
		expectRelClose(fromMbar(1, 'inHg'), 0.02952998); // NIST SP 811 App. B.8, units.md derived table
		expectRelClose(convertPressure(1, 'kPa', 'inHg'), 0.2952998); // NIST SP 811 App. B.8, units.md
		expectRelClose(toMbar(1, 'inH2O'), 2.490889); // NIST SP 811 App. B.8, units.md derived table
		expectRelClose(fromMbar(1, 'inH2O'), 0.4014631); // NIST SP 811 App. B.8, units.md derived table
		expectRelClose(convertPressure(1, 'kPa', 'inH2O'), 4.014631); // NIST SP 811 App. B.8, units.md
		expectRelClose(toMbar(1, 'psi'), 68.94757); // NIST SP 811 App. B.8, units.md derived table
		expectRelClose(fromMbar(1, 'psi'), 0.01450377); // NIST SP 811 App. B.8, units.md derived table
		expectRelClose(convertPressure(1, 'kPa', 'psi'), 0.1450377); // NIST SP 811 App. B.8, units.md
	});

	it('turns one standard atmosphere into the units.md figures', () => {
		// NIST SP 811 App. B.8: atm 1.013 25 E+05 Pa (exact); units.md: = 29.92125 inHg = 14.69595 psi
		expect(convertPressure(101.325, 'kPa', 'mbar')).toBeCloseTo(1013.25, 9);
		expectRelClose(fromMbar(1013.25, 'inHg'), 29.92125);
		expectRelClose(fromMbar(1013.25, 'psi'), 14.69595);
		expectRelClose(fromMbar(1013.25, 'kPa'), 101.325, 1e-12);
		expectRelClose(fromMbar(1013.25, 'hPa'), 1013.25, 1e-12);
	});

	it('agrees with the WMO CIMO Guide value for an inch of mercury', () => {
		// WMO-No. 8 Annex 3.A, quoted in units.md: 1 (in Hg)ₙ = 33.863 9 hPa (5 decimals printed)
		expect(convertPressure(1, 'inHg', 'hPa')).toBeCloseTo(33.8639, 4);
	});

	it('reads a 30 inHg vacuum gauge as about one bar', () => {
		// check value: common trade practice, no published source (30 inHg ≈ 1 bar, within ~2 %)
		const mbar = toMbar(30, 'inHg');
		expect(Math.abs(mbar - 1000) / 1000).toBeLessThan(0.02);
		// NIST SP 811 App. B.8: 30 × 33.86389 mbar = 1015.9167 mbar
		expect(mbar).toBeCloseTo(1015.9167, 3);
	});

	const unit = fc.constantFrom<PressureUnit>(...PRESSURE_UNITS);
	const pressure = fc.double({ min: -1e6, max: 1e6, noNaN: true });

	it('round-trips any value between any two units', () => {
		fc.assert(
			fc.property(pressure, unit, unit, (value, from, to) => {
				const back = convertPressure(convertPressure(value, from, to), to, from);
				expect(Math.abs(back - value)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(value)));
			})
		);
	});

	it('gives the same answer directly or through a third unit', () => {
		fc.assert(
			fc.property(pressure, unit, unit, unit, (value, a, b, c) => {
				const direct = convertPressure(value, a, c);
				const via = convertPressure(convertPressure(value, a, b), b, c);
				expect(Math.abs(via - direct)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(direct)));
			})
		);
	});
});

describe('formatPressure', () => {
	it('shows 150 mbar as 4.43 inHg', () => {
		// NIST SP 811 App. B.8: 150 × 0.02952998 = 4.4295 inHg, two decimals
		expect(formatPressure(150, 'inHg')).toBe('4.43 inHg');
	});

	it('uses decimals that suit each unit', () => {
		// NIST SP 811 App. B.8: 123.4 mbar = 12.34 kPa = 1.7898 psi = 49.54 inH2O
		expect(formatPressure(123.4, 'mbar')).toBe('123 mbar');
		expect(formatPressure(123.4, 'hPa')).toBe('123 hPa');
		expect(formatPressure(123.4, 'kPa')).toBe('12.3 kPa');
		expect(formatPressure(123.4, 'psi')).toBe('1.79 psi');
		expect(formatPressure(123.4, 'inH2O')).toBe('49.5 inH2O');
	});

	it('accepts a decimals override', () => {
		expect(formatPressure(123.4, 'mbar', 1)).toBe('123.4 mbar');
	});

	it('never prints a negative zero', () => {
		expect(formatPressure(-0.2, 'mbar')).toBe('0 mbar');
		expect(formatPressure(-0.001, 'inHg')).toBe('0.00 inHg');
	});

	it('shows a dash for a missing value', () => {
		expect(formatPressure(Number.NaN, 'mbar')).toBe('—');
		expect(formatPressure(Infinity, 'psi')).toBe('—');
	});
});

describe('isPressureUnit', () => {
	it('accepts only the exact unit spellings', () => {
		expect(isPressureUnit('inHg')).toBe(true);
		expect(isPressureUnit('inhg')).toBe(false);
		expect(isPressureUnit('bar')).toBe(false);
	});
});
