import { describe, expect, it } from 'vitest';
import { parseDateCell, parseNumberCell, zonedTimeToUtc } from './import-values';

describe('parseNumberCell', () => {
	it('reads plain decimals and exponents', () => {
		expect(parseNumberCell(' 123.5 ', false)).toEqual({ ok: true, value: 123.5 });
		expect(parseNumberCell('-2e3', false)).toEqual({ ok: true, value: -2000 });
	});
	it('reads a decimal comma only where the separator is not a comma', () => {
		expect(parseNumberCell('12,5', true)).toEqual({ ok: true, value: 12.5 });
		expect(parseNumberCell('12,5', false)).toMatchObject({ ok: false });
	});
	it('refuses words, blanks and thousands separators', () => {
		expect(parseNumberCell('abc', false)).toMatchObject({
			ok: false,
			expected: 'a number such as 123.4'
		});
		expect(parseNumberCell('', false)).toMatchObject({ ok: false });
		expect(parseNumberCell('1,234.5', true)).toMatchObject({ ok: false });
	});
});

describe('parseDateCell', () => {
	it('reads ISO dates with a zone as that instant', () => {
		expect(parseDateCell('2025-03-14T08:30:00Z', 'iso', 'Europe/London')).toEqual({
			ok: true,
			value: new Date('2025-03-14T08:30:00Z')
		});
		expect(parseDateCell('2025-03-14 08:30+01:00', 'iso', 'UTC')).toEqual({
			ok: true,
			value: new Date('2025-03-14T07:30:00Z')
		});
	});

	it("reads a time without a zone as local time in the importer's zone, across daylight saving", () => {
		// check values: UK clocks are on GMT (UTC+0) in January and BST (UTC+1) in July
		// (The Summer Time Order 2002, SI 2002/262: BST from the last Sunday in March to the last Sunday in October)
		expect(parseDateCell('2025-01-10 09:00', 'iso', 'Europe/London')).toEqual({
			ok: true,
			value: new Date('2025-01-10T09:00:00Z')
		});
		expect(parseDateCell('2025-07-10 09:00', 'iso', 'Europe/London')).toEqual({
			ok: true,
			value: new Date('2025-07-10T08:00:00Z')
		});
	});

	it('reads day-first and month-first dates', () => {
		expect(parseDateCell('14/03/2025 08:30', 'dmy', 'UTC')).toEqual({
			ok: true,
			value: new Date('2025-03-14T08:30:00Z')
		});
		expect(parseDateCell('03/14/2025 08:30', 'mdy', 'UTC')).toEqual({
			ok: true,
			value: new Date('2025-03-14T08:30:00Z')
		});
		expect(parseDateCell('14.03.2025', 'dmy', 'UTC')).toEqual({
			ok: true,
			value: new Date('2025-03-14T00:00:00Z')
		});
	});

	it('refuses dates that are not on the calendar and says what was expected', () => {
		expect(parseDateCell('2025-02-30 08:00', 'iso', 'UTC')).toMatchObject({
			ok: false,
			expected: expect.stringContaining('does not exist')
		});
		expect(parseDateCell('03/14/2025', 'dmy', 'UTC')).toMatchObject({ ok: false });
		expect(parseDateCell('yesterday', 'iso', 'UTC')).toMatchObject({
			ok: false,
			expected: 'a date such as 2025-03-14 08:30'
		});
	});
});

describe('zonedTimeToUtc', () => {
	it('settles on the right side of the spring-forward change', () => {
		// 2025-03-30 02:30 does not exist in London (clocks go 01:00 GMT → 02:00 BST; SI 2002/262);
		// 03:30 local that day is BST, 02:30 UTC
		expect(zonedTimeToUtc(Date.UTC(2025, 2, 30, 3, 30), 'Europe/London').toISOString()).toBe(
			'2025-03-30T02:30:00.000Z'
		);
	});
});
