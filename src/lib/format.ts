import { format } from 'date-fns';
import { TZDate } from '@date-fns/tz';
import { enGB, enUS, de, fr, nl } from 'date-fns/locale';
import { formatPressure, type PressureUnit } from './domain/units';

/** Pressure in the viewer's preferred unit; readings are stored in mbar. */
export function showPressure(mbar: number | null | undefined, unit: PressureUnit): string {
	if (mbar === null || mbar === undefined || !Number.isFinite(mbar)) return '—';
	return formatPressure(mbar, unit);
}

const LOCALES = { 'en-GB': enGB, 'en-US': enUS, de, fr, nl } as const;
const localeOf = (tag: string) =>
	LOCALES[tag as keyof typeof LOCALES] ??
	LOCALES[tag.split('-')[0] as keyof typeof LOCALES] ??
	enGB;

/** A date-fns date in the viewer's time zone, so a reading late at night lands on the right day. */
function zoned(value: string | Date, timeZone: string): TZDate {
	return new TZDate(new Date(value).getTime(), timeZone);
}

export function showDate(
	value: string | Date | null | undefined,
	locale = 'en-GB',
	timeZone = 'Europe/London'
): string {
	if (!value) return '—';
	return format(zoned(value, timeZone), 'PP', { locale: localeOf(locale) });
}

export function showDateTime(
	value: string | Date | null | undefined,
	locale = 'en-GB',
	timeZone = 'Europe/London'
): string {
	if (!value) return '—';
	return format(zoned(value, timeZone), 'PP, p', { locale: localeOf(locale) });
}

export function showNumber(
	value: number | null | undefined,
	decimals = 0,
	locale = 'en-GB'
): string {
	if (value === null || value === undefined || !Number.isFinite(value)) return '—';
	return new Intl.NumberFormat(locale, {
		maximumFractionDigits: decimals,
		minimumFractionDigits: decimals
	}).format(value);
}

/** A file size as people read it: "840 KB", "2.4 MB". */
export function showBytes(bytes: number, locale = 'en-GB'): string {
	if (bytes >= 1024 * 1024) return `${showNumber(bytes / (1024 * 1024), 1, locale)} MB`;
	if (bytes >= 1024) return `${showNumber(bytes / 1024, 0, locale)} KB`;
	return `${showNumber(bytes, 0, locale)} bytes`;
}
