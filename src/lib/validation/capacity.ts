import { z } from 'zod';
import { VISIT_KINDS, minutesOfDay, type VisitKind } from '../domain/visits';
import { formId, requiredText } from './helpers';

const trimmed = (v: unknown) => (typeof v === 'string' ? v.trim() : v);

const clockTime = (label: string) =>
	z.preprocess(
		trimmed,
		z
			.string({ error: `Enter the ${label} time` })
			.min(1, `Enter the ${label} time`)
			.regex(/^([01]\d|2[0-3]):[0-5]\d$/, `Enter the ${label} time as HH:MM, e.g. 08:00`)
			.refine((t) => minutesOfDay(t) % 15 === 0, `The ${label} time must be on a quarter hour`)
	);

/** Whether the runtime knows this IANA zone (the same check the booking clock relies on). */
export function isTimeZone(zone: string): boolean {
	try {
		new Intl.DateTimeFormat('en-GB', { timeZone: zone });
		return zone.includes('/') || zone === 'UTC';
	} catch {
		return false;
	}
}

/** A checkbox group arrives as nothing, one string, or several. */
const checkboxGroup = (v: unknown) => (v === undefined ? [] : Array.isArray(v) ? v : [v]);

export const capacityHoursSchema = z
	.object({
		baysPerDay: z.preprocess(
			(v) => (typeof v === 'string' ? (v.trim() === '' ? undefined : Number(v.trim())) : v),
			z
				.number({ error: 'Enter how many bays you have each day' })
				.int('Bays per day must be a whole number')
				.min(1, 'Bays per day must be between 1 and 50')
				.max(50, 'Bays per day must be between 1 and 50')
		),
		opensAt: clockTime('opening'),
		closesAt: clockTime('closing'),
		timeZone: z.preprocess(
			trimmed,
			z
				.string({ error: 'Choose your time zone' })
				.min(1, 'Choose your time zone')
				.refine(isTimeZone, 'Choose a time zone from the list, e.g. Europe/London')
		),
		openDays: z.preprocess(
			checkboxGroup,
			z
				.array(z.coerce.number().int().min(1).max(7), { error: 'Choose the days you are open' })
				.min(1, 'Choose at least one day you are open')
		)
	})
	.refine((v) => minutesOfDay(v.closesAt) > minutesOfDay(v.opensAt), {
		path: ['closesAt'],
		message: 'Closing time must be after opening time'
	});
export type CapacityHoursInput = z.infer<typeof capacityHoursSchema>;

const isoDate = (d: string) => new Date(`${d}T12:00:00Z`).toISOString().slice(0, 10);

export const closedDaySchema = z.object({
	day: z.preprocess(
		trimmed,
		z
			.string({ error: 'Enter the date you are closed' })
			.min(1, 'Enter the date you are closed')
			.regex(/^\d{4}-\d{2}-\d{2}$/, 'Enter the date as YYYY-MM-DD')
			.refine(
				(d) => !Number.isNaN(Date.parse(`${d}T12:00:00Z`)) && isoDate(d) === d,
				'Enter a real date, e.g. 2026-12-24'
			)
	),
	note: requiredText(200, 'Reason')
});
export type ClosedDayInput = z.infer<typeof closedDaySchema>;

export const removeClosedDaySchema = z.object({
	closedDayId: formId.catch(0).refine((n) => n > 0, 'That closed day was not found')
});

/** Field names of the visit-kinds form, one pair per kind. */
export const minutesField = (kind: VisitKind) => `minutes_${kind}`;
export const offeredField = (kind: VisitKind) => `offered_${kind}`;

/** `noun` carries its article: "an inspection". */
const minutes = (noun: string) => {
	const Noun = noun[0].toUpperCase() + noun.slice(1);
	return z.preprocess(
		(v) => (typeof v === 'string' ? (v.trim() === '' ? undefined : Number(v.trim())) : v),
		z
			.number({ error: `Enter how many minutes ${noun} takes` })
			.int(`The length of ${noun} must be whole minutes`)
			.min(15, `${Noun} must take between 15 and 480 minutes`)
			.max(480, `${Noun} must take between 15 and 480 minutes`)
			.refine((n) => n % 15 === 0, `The length of ${noun} must be a multiple of 15 minutes`)
	);
};

const kindShape = Object.fromEntries(
	VISIT_KINDS.flatMap((kind) => [
		[minutesField(kind), minutes(kindNoun(kind))],
		[offeredField(kind), z.preprocess((v) => v === 'on' || v === 'true', z.boolean())]
	])
) as Record<string, z.ZodType>;

function kindNoun(kind: VisitKind): string {
	return {
		inspection: 'an inspection',
		sensor_check: 'a sensor and pipe check',
		service_regen: 'a service regeneration',
		off_vehicle_cleaning: 'an off-vehicle filter cleaning',
		replacement: 'a filter replacement'
	}[kind];
}

export const visitKindsSchema = z
	.object(kindShape)
	.transform((v) =>
		VISIT_KINDS.map((kind) => ({
			kind,
			durationMinutes: v[minutesField(kind)] as number,
			offered: v[offeredField(kind)] as boolean
		}))
	)
	.refine((kinds) => kinds.some((k) => k.offered), {
		path: ['kinds'],
		message: 'Offer at least one kind of visit, or fleets cannot book you'
	});
export type VisitKindsInput = z.infer<typeof visitKindsSchema>;
