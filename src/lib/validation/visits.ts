import { z } from 'zod';
import { VISIT_KINDS } from '../domain/visits';
import { optionalText, requiredText } from './helpers';

const localDateTime = z.preprocess(
	(v) => (typeof v === 'string' ? v.trim() : v),
	z
		.string({ error: 'Enter the date and time of the visit' })
		.regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}$/, 'Enter the date and time of the visit')
);

export const visitRequestSchema = z.object({
	workshopId: z.coerce.number({ error: 'Choose a workshop' }).int().positive('Choose a workshop'),
	visitKind: z.enum(VISIT_KINDS, { error: 'Choose the kind of visit' }),
	startsAt: localDateTime,
	note: optionalText(1000, 'Note')
});
export type VisitRequestFormInput = z.infer<typeof visitRequestSchema>;

export const rescheduleSchema = z.object({
	startsAt: localDateTime,
	reason: requiredText(1000, 'A reason for the new time')
});

// Each form on the visit page has its own field names, so their ids (field-<name>) stay unique.
export const declineSchema = z.object({
	declineReason: requiredText(1000, 'A reason for declining')
});
export const cancelSchema = z.object({
	cancelReason: requiredText(1000, 'A reason for cancelling')
});

const VISIT_ACTION_VALUES = [
	'regen_service',
	'filter_cleaning',
	'filter_replacement',
	'sensor_repair',
	'pipe_repair'
] as const;
const optionalMbar = (label: string) =>
	z.preprocess(
		(v) =>
			typeof v === 'string'
				? v.trim() === ''
					? undefined
					: Number(v.trim().replace(',', '.'))
				: v,
		z
			.number({ error: `${label} must be a number in mbar` })
			.min(0, `${label} must be between 0 and 1000 mbar`)
			.max(1000, `${label} must be between 0 and 1000 mbar`)
			.optional()
	);

export const visitReportSchema = z.object({
	visitedAt: z.preprocess(
		(v) => (typeof v === 'string' ? v.trim() : v),
		z
			.string({ error: 'Enter when the work was done' })
			.regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}$/, 'Enter when the work was done')
	),
	findings: requiredText(4000, 'Findings'),
	actions: z.preprocess(
		(v) => (v === undefined ? [] : Array.isArray(v) ? v : [v]),
		z.array(z.enum(VISIT_ACTION_VALUES, { error: 'Choose actions from the list' }))
	),
	idleBeforeMbar: optionalMbar('Δp at idle before the work'),
	idleAfterMbar: optionalMbar('Δp at idle after the work'),
	odometerKm: z.preprocess(
		(v) => (typeof v === 'string' ? (v.trim() === '' ? undefined : Number(v.trim())) : v),
		z
			.number({ error: 'Odometer must be a number of km' })
			.int('Odometer must be whole km')
			.min(0, 'Odometer must be between 0 and 3,000,000 km')
			.max(3_000_000, 'Odometer must be between 0 and 3,000,000 km')
			.optional()
	),
	sensorTestId: z.preprocess(
		(v) => (v === '' || v === undefined ? undefined : Number(v)),
		z.number().int().positive().optional()
	),
	usage: optionalText(1000, 'Usage profile'),
	fuel: optionalText(1000, 'Fuel'),
	oilGrade: optionalText(1000, 'Engine oil'),
	serviceHistory: optionalText(1000, 'Service history'),
	engineFaults: optionalText(1000, 'Engine faults'),
	signOff: z.preprocess((v) => v === 'on' || v === 'true', z.boolean())
});

export const removeAttachmentSchema = z.object({
	attachmentId: z.coerce.number({ error: 'Choose a file to remove' }).int().positive()
});
