import { describe, expect, it } from 'vitest';
import type { z } from 'zod';
import { capacityHoursSchema, closedDaySchema, visitKindsSchema } from './capacity';

/** First message per field, as the form shows them. */
function messages(schema: z.ZodType, input: unknown): Record<string, string> {
	const result = schema.safeParse(input);
	if (result.success) return {};
	const out: Record<string, string> = {};
	for (const issue of result.error.issues) out[issue.path.join('.') || 'form'] ??= issue.message;
	return out;
}

const hours = {
	baysPerDay: '2',
	opensAt: '08:00',
	closesAt: '17:00',
	timeZone: 'Europe/London',
	openDays: ['1', '2', '3', '4', '5']
};

describe('capacity hours form', () => {
	it('accepts a normal week and turns the checked days into numbers', () => {
		const parsed = capacityHoursSchema.parse(hours);
		expect(parsed).toEqual({ ...hours, baysPerDay: 2, openDays: [1, 2, 3, 4, 5] });
	});

	it('accepts a single open day (a lone checkbox arrives as a string)', () => {
		expect(capacityHoursSchema.parse({ ...hours, openDays: '6' }).openDays).toEqual([6]);
	});

	it('says what is wrong with each field', () => {
		expect(
			messages(capacityHoursSchema, {
				baysPerDay: '0',
				opensAt: '8am',
				closesAt: '17:10',
				timeZone: 'Mars/Olympus'
			})
		).toEqual({
			baysPerDay: 'Bays per day must be between 1 and 50',
			opensAt: 'Enter the opening time as HH:MM, e.g. 08:00',
			closesAt: 'The closing time must be on a quarter hour',
			timeZone: 'Choose a time zone from the list, e.g. Europe/London',
			openDays: 'Choose at least one day you are open'
		});
		expect(messages(capacityHoursSchema, { ...hours, baysPerDay: '51' }).baysPerDay).toBe(
			'Bays per day must be between 1 and 50'
		);
		expect(messages(capacityHoursSchema, { ...hours, baysPerDay: '1.5' }).baysPerDay).toBe(
			'Bays per day must be a whole number'
		);
		expect(messages(capacityHoursSchema, { ...hours, baysPerDay: '' }).baysPerDay).toBe(
			'Enter how many bays you have each day'
		);
	});

	it('wants closing after opening', () => {
		for (const closesAt of ['08:00', '07:45'])
			expect(messages(capacityHoursSchema, { ...hours, closesAt })).toEqual({
				closesAt: 'Closing time must be after opening time'
			});
	});
});

describe('closed day form', () => {
	it('wants a real date and a reason', () => {
		expect(messages(closedDaySchema, { day: '2026-02-30', note: ' ' })).toEqual({
			day: 'Enter a real date, e.g. 2026-12-24',
			note: 'Reason is required'
		});
		expect(messages(closedDaySchema, { day: '24/12/2026', note: 'Holiday' })).toEqual({
			day: 'Enter the date as YYYY-MM-DD'
		});
		expect(closedDaySchema.parse({ day: '2026-12-24', note: ' Christmas Eve ' })).toEqual({
			day: '2026-12-24',
			note: 'Christmas Eve'
		});
	});
});

describe('visit kinds form', () => {
	const all = {
		minutes_inspection: '60',
		offered_inspection: 'on',
		minutes_sensor_check: '45',
		offered_sensor_check: 'on',
		minutes_service_regen: '120',
		minutes_off_vehicle_cleaning: '240',
		offered_off_vehicle_cleaning: 'on',
		minutes_replacement: '180',
		offered_replacement: 'on'
	};

	it('reads one length and one offered box per standard kind', () => {
		const kinds = visitKindsSchema.parse(all);
		expect(kinds).toHaveLength(5);
		expect(kinds.find((k) => k.kind === 'service_regen')).toEqual({
			kind: 'service_regen',
			durationMinutes: 120,
			offered: false
		});
		expect(kinds.find((k) => k.kind === 'sensor_check')?.durationMinutes).toBe(45);
	});

	it('wants lengths in quarter hours from 15 to 480 minutes', () => {
		expect(
			messages(visitKindsSchema, {
				...all,
				minutes_inspection: '50',
				minutes_replacement: '495',
				minutes_sensor_check: '0'
			})
		).toEqual({
			minutes_inspection: 'The length of an inspection must be a multiple of 15 minutes',
			minutes_replacement: 'A filter replacement must take between 15 and 480 minutes',
			minutes_sensor_check: 'A sensor and pipe check must take between 15 and 480 minutes'
		});
	});

	it('refuses to offer nothing at all', () => {
		const none = Object.fromEntries(Object.entries(all).filter(([k]) => k.startsWith('minutes')));
		expect(messages(visitKindsSchema, none)).toEqual({
			kinds: 'Offer at least one kind of visit, or fleets cannot book you'
		});
	});
});
