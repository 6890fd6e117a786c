import { describe, expect, it } from 'vitest';
import { showDate, showDateTime, showPressure } from './format';

describe('dates in the viewer’s locale and time zone', () => {
	// 23:30 UTC on 31 March 2026 is already 1 April in Berlin (CEST, UTC+2 from 29 March 2026:
	// EU summer time starts on the last Sunday of March, Directive 2000/84/EC).
	const lateEvening = '2026-03-31T23:30:00Z';

	it('puts a late reading on the local day', () => {
		expect(showDate(lateEvening, 'en-GB', 'Europe/London')).toBe('1 Apr 2026'); // BST, UTC+1
		expect(showDate(lateEvening, 'en-GB', 'UTC')).toBe('31 Mar 2026');
		expect(showDate(lateEvening, 'en-US', 'America/New_York')).toBe('Mar 31, 2026');
	});

	it('shows the local clock time', () => {
		expect(showDateTime(lateEvening, 'en-GB', 'Europe/Berlin')).toBe('1 Apr 2026, 01:30');
	});

	it('says so when there is no date', () => {
		expect(showDate(null)).toBe('—');
	});
});

describe('pressures in the viewer’s unit', () => {
	it('converts from the stored mbar', () => {
		// 1 kPa = 10 mbar exactly (NIST SP 811 App. B.8: kPa 1.0 E+03 Pa, millibar 1.0 E+02 Pa).
		expect(showPressure(300, 'kPa')).toMatch(/^30(\.0+)? kPa$/);
		expect(showPressure(null, 'mbar')).toBe('—');
	});
});
