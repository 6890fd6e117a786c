/**
 * Reading the text of one CSV cell: numbers (with a decimal comma where the separator allows
 * it) and dates in the three orders people write them, with or without a zone. A time without
 * a zone is local time in the importer's time zone.
 */
import type { DateFormat } from '../../validation/imports';

/** A parsed value, or what was expected (completes "expected …, found …"). */
export type Parsed<T> = { ok: true; value: T } | { ok: false; expected: string };

const NUMBER = /^[+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:e[+-]?\d+)?$/i;

/** A plain decimal; a comma decimal mark only when the file's separator is not a comma. */
export function parseNumberCell(text: string, decimalComma: boolean): Parsed<number> {
	const t = text.trim();
	if (!NUMBER.test(t) || (!decimalComma && t.includes(','))) {
		return {
			ok: false,
			expected: decimalComma ? 'a number such as 123.4 or 123,4' : 'a number such as 123.4'
		};
	}
	const value = Number(t.replace(',', '.'));
	return Number.isFinite(value) ? { ok: true, value } : { ok: false, expected: 'a number' };
}

const ISO =
	/^(\d{4})-(\d{1,2})-(\d{1,2})(?:[T ](\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d+))?)?)?\s*(Z|[+-]\d{2}(?::?\d{2})?)?$/i;
const SLASHED =
	/^(\d{1,2})[./-](\d{1,2})[./-](\d{4})(?:[ T,]+(\d{1,2}):(\d{2})(?::(\d{2}))?)?\s*(Z|[+-]\d{2}(?::?\d{2})?)?$/i;

const EXAMPLE: Record<DateFormat, string> = {
	iso: 'a date such as 2025-03-14 08:30',
	dmy: 'a date such as 14/03/2025 08:30 (day first)',
	mdy: 'a date such as 03/14/2025 08:30 (month first)'
};

const offsetCache = new Map<string, Intl.DateTimeFormat>();

/** Milliseconds the zone is ahead of UTC at the instant `utcMs`. */
function zoneOffsetMs(utcMs: number, timeZone: string): number {
	let format = offsetCache.get(timeZone);
	if (!format) {
		format = new Intl.DateTimeFormat('en-US', {
			timeZone,
			hourCycle: 'h23',
			year: 'numeric',
			month: 'numeric',
			day: 'numeric',
			hour: 'numeric',
			minute: 'numeric',
			second: 'numeric'
		});
		offsetCache.set(timeZone, format);
	}
	const p: Record<string, number> = {};
	for (const part of format.formatToParts(new Date(utcMs)))
		if (part.type !== 'literal') p[part.type] = Number(part.value);
	const asUtc = Date.UTC(p.year, p.month - 1, p.day, p.hour, p.minute, p.second);
	return asUtc - Math.floor(utcMs / 1000) * 1000;
}

/** Offsets are looked up once per zone and hour: a 100,000-row file has few distinct hours. */
const hourOffsets = new Map<string, number>();

/** Local wall-clock time in `timeZone` → the instant. */
export function zonedTimeToUtc(wallMs: number, timeZone: string): Date {
	const key = `${timeZone}|${Math.floor(wallMs / 3_600_000)}`;
	let offset = hourOffsets.get(key);
	if (offset === undefined) {
		// Two passes settle the offset across a daylight-saving change
		offset = zoneOffsetMs(wallMs, timeZone);
		const second = zoneOffsetMs(wallMs - offset, timeZone);
		if (second !== offset) offset = second;
		if (hourOffsets.size > 50_000) hourOffsets.clear();
		hourOffsets.set(key, offset);
	}
	return new Date(wallMs - offset);
}

function daysIn(year: number, month: number): number {
	return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

function zoneMinutes(zone: string): number {
	if (zone.toUpperCase() === 'Z') return 0;
	const sign = zone[0] === '-' ? -1 : 1;
	const digits = zone.slice(1).replace(':', '');
	return sign * (Number(digits.slice(0, 2)) * 60 + Number(digits.slice(2, 4) || '0'));
}

/**
 * A date, optionally with a time (HH:MM[:SS[.fff]]) and zone (Z, +01:00, +0100).
 * @param format which order the day, month and year come in
 * @param timeZone IANA zone for times written without one
 */
export function parseDateCell(text: string, format: DateFormat, timeZone: string): Parsed<Date> {
	const t = text.trim();
	let y: number,
		mo: number,
		d: number,
		h: number,
		mi: number,
		s: number,
		ms: number,
		zone: string | undefined;
	if (format === 'iso') {
		const m = ISO.exec(t);
		if (!m) return { ok: false, expected: EXAMPLE.iso };
		[y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
		[h, mi, s] = [Number(m[4] ?? 0), Number(m[5] ?? 0), Number(m[6] ?? 0)];
		ms = m[7] ? Number(m[7].slice(0, 3).padEnd(3, '0')) : 0;
		zone = m[8];
	} else {
		const m = SLASHED.exec(t);
		if (!m) return { ok: false, expected: EXAMPLE[format] };
		const [a, b] = [Number(m[1]), Number(m[2])];
		[d, mo] = format === 'dmy' ? [a, b] : [b, a];
		y = Number(m[3]);
		[h, mi, s, ms] = [Number(m[4] ?? 0), Number(m[5] ?? 0), Number(m[6] ?? 0), 0];
		zone = m[7];
	}
	if (mo < 1 || mo > 12 || d < 1 || d > daysIn(y, mo) || h > 23 || mi > 59 || s > 59) {
		return { ok: false, expected: `${EXAMPLE[format]} (this one does not exist on the calendar)` };
	}
	const wall = Date.UTC(y, mo - 1, d, h, mi, s, ms);
	if (zone !== undefined) return { ok: true, value: new Date(wall - zoneMinutes(zone) * 60_000) };
	return { ok: true, value: zonedTimeToUtc(wall, timeZone) };
}
