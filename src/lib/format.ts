import { formatPressure, type PressureUnit } from './domain/units';

/** Pressure in the viewer's preferred unit; readings are stored in mbar. */
export function showPressure(mbar: number | null | undefined, unit: PressureUnit): string {
	if (mbar === null || mbar === undefined || !Number.isFinite(mbar)) return '—';
	return formatPressure(mbar, unit);
}

export function showDate(
	value: string | Date | null | undefined,
	locale = 'en-GB',
	timeZone = 'Europe/London'
): string {
	if (!value) return '—';
	return new Intl.DateTimeFormat(locale, { day: 'numeric', month: 'short', year: 'numeric', timeZone }).format(
		new Date(value)
	);
}

export function showDateTime(
	value: string | Date | null | undefined,
	locale = 'en-GB',
	timeZone = 'Europe/London'
): string {
	if (!value) return '—';
	return new Intl.DateTimeFormat(locale, {
		day: 'numeric',
		month: 'short',
		year: 'numeric',
		hour: '2-digit',
		minute: '2-digit',
		timeZone
	}).format(new Date(value));
}

export function showNumber(value: number | null | undefined, decimals = 0, locale = 'en-GB'): string {
	if (value === null || value === undefined || !Number.isFinite(value)) return '—';
	return new Intl.NumberFormat(locale, { maximumFractionDigits: decimals, minimumFractionDigits: decimals }).format(value);
}
