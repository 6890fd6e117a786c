/**
 * Pressure units a technician meets around a DPF: the portal stores mbar, gauges and sensor
 * sheets speak hPa, kPa, psi, inches of mercury and inches of water.
 */
import { PRESSURE_UNITS, type PressureUnitCode } from './vocabulary';

/** A pressure unit Sootcast converts between (the stored list lives in vocabulary.ts). */
export type PressureUnit = PressureUnitCode;

export { PRESSURE_UNITS };

/**
 * Pascals in one of each unit. Source: NIST SP 811 (2008), Appendix B.8. The conventional manometer units are used because vacuum
 * gauges are graduated in them; SP 811 rounds them to the digits below.
 */
export const PASCALS_PER_UNIT: Readonly<Record<PressureUnit, number>> = Object.freeze({
	// NIST SP 811 App. B.8: millibar 1.0 E+02 Pa (exact)
	mbar: 100,
	// SI prefix: 1 hPa = 100 Pa (exact), the same size as the millibar
	hPa: 100,
	// SI prefix: 1 kPa = 1000 Pa (exact)
	kPa: 1000,
	// NIST SP 811 App. B.8: pound-force per square inch 6.894 757 E+03 Pa (rounded)
	psi: 6894.757,
	// NIST SP 811 App. B.8: inch of mercury, conventional 3.386 389 E+03 Pa (rounded)
	inHg: 3386.389,
	// NIST SP 811 App. B.8: inch of water, conventional 2.490 889 E+02 Pa (rounded)
	inH2O: 249.0889
});

/**
 * Decimals shown per unit: each step is at most about half a millibar, finer than a Δp
 * sensor resolves, without printing noise digits.
 */
export const DISPLAY_DECIMALS: Readonly<Record<PressureUnit, number>> = Object.freeze({
	mbar: 0,
	hPa: 0,
	kPa: 1,
	psi: 2,
	inHg: 2,
	inH2O: 1
});

/** True when `value` names a pressure unit Sootcast knows (exact, case-sensitive spelling). */
export function isPressureUnit(value: string): value is PressureUnit {
	return (PRESSURE_UNITS as readonly string[]).includes(value);
}

/**
 * Converts a pressure between units through pascals.
 * @param value pressure in `from` units; any finite number (gauge or differential)
 * @returns the same pressure in `to` units
 * Source: NIST SP 811 App. B.8 factors in {@link PASCALS_PER_UNIT}.
 */
export function convertPressure(value: number, from: PressureUnit, to: PressureUnit): number {
	if (from === to) return value;
	return (value * PASCALS_PER_UNIT[from]) / PASCALS_PER_UNIT[to];
}

/** Converts a pressure in `from` units to millibar (NIST SP 811 App. B.8 factors). */
export function toMbar(value: number, from: PressureUnit): number {
	return convertPressure(value, from, 'mbar');
}

/** Converts a pressure in millibar to `to` units (NIST SP 811 App. B.8 factors). */
export function fromMbar(mbar: number, to: PressureUnit): number {
	return convertPressure(mbar, 'mbar', to);
}

/**
 * Formats a pressure held in mbar for display in `unit`, e.g. 150 mbar → "4.43 inHg".
 * @param mbar pressure in millibar
 * @param unit display unit
 * @param decimals override the per-unit default in {@link DISPLAY_DECIMALS}
 * @returns "—" for a missing or non-finite value, so a table cell never shows "NaN"
 */
export function formatPressure(mbar: number, unit: PressureUnit, decimals?: number): string {
	if (!Number.isFinite(mbar)) return '—';
	const places = decimals ?? DISPLAY_DECIMALS[unit];
	const text = fromMbar(mbar, unit).toFixed(places);
	// "-0" or "-0.00" after rounding reads as a fault; show it as zero
	const shown = Number(text) === 0 ? (0).toFixed(places) : text;
	return `${shown} ${unit}`;
}
