import { z } from 'zod';
import { FUELS, PRESSURE_UNITS, TEST_CONDITIONS } from '../domain/vocabulary';
import { formNumber, optionalFormNumber, optionalText, requiredText } from './helpers';

export const vehicleDetailsSchema = z.object({
	registration: requiredText(16, 'Registration').pipe(
		z
			.string()
			.regex(/^[A-Z0-9 -]+$/i, 'Registration may hold only letters, digits, spaces and dashes')
	),
	vin: optionalText(17, 'VIN').pipe(
		z
			.string()
			.regex(/^[A-HJ-NPR-Z0-9]{17}$/i, 'A VIN has 17 letters and digits (no I, O or Q)')
			.optional()
	),
	makeModel: optionalText(120, 'Make and model'),
	engineDisplacementCc: optionalFormNumber('Engine size', 500, 10000, 'cc'),
	emissionClass: optionalText(16, 'Emission class'),
	fuel: z.enum(FUELS, { error: 'Choose a fuel from the list' }),
	oilGrade: optionalText(32, 'Oil grade'),
	referenceFlowM3h: optionalFormNumber('Reference flow', 10, 5000, 'm³/h')
});
export type VehicleDetailsInput = z.infer<typeof vehicleDetailsSchema>;

export const newReadingSchema = z.object({
	takenAt: z.preprocess(
		(v) => (typeof v === 'string' && v.trim() !== '' ? new Date(v) : undefined),
		z
			.date({ error: 'Enter the date and time of the reading' })
			.refine((d) => !Number.isNaN(d.getTime()), 'Enter a valid date and time')
	),
	deltaP: formNumber('Pressure', 0, 100000),
	unit: z.enum(PRESSURE_UNITS, { error: 'Choose a unit' }),
	condition: z.enum(TEST_CONDITIONS, { error: 'Choose the test condition' }),
	odometerKm: optionalFormNumber('Odometer', 0, 3_000_000, 'km'),
	rpm: optionalFormNumber('Engine speed', 0, 8000, 'rpm')
});
export type NewReadingInput = z.infer<typeof newReadingSchema>;

export const NOTIFIABLE_STATUSES = ['over_line', 'crossing_soon', 'watch', 'check_sensor'] as const;

export const unitPreferenceSchema = z.object({
	name: requiredText(120, 'Name'),
	unitPreference: z.enum(PRESSURE_UNITS, { error: 'Choose a pressure unit' }),
	notifyDigest: z.preprocess((v) => v === 'on' || v === 'true', z.boolean()),
	notifyStatuses: z.preprocess(
		(v) => (v === undefined ? [] : Array.isArray(v) ? v : [v]),
		z.array(z.enum(NOTIFIABLE_STATUSES, { error: 'Choose statuses from the list' }))
	),
	adviceEmails: z.preprocess((v) => v === 'on' || v === 'true', z.boolean()),
	crossingWindowDays: formNumber('Crossing window', 1, 365, 'days').pipe(
		z.number().int('Crossing window must be a whole number of days')
	)
});
export type UnitPreferenceInput = z.infer<typeof unitPreferenceSchema>;

export const listQuerySchema = z.object({
	page: z.coerce.number().int().min(1).max(100000).catch(1),
	pageSize: z.coerce.number().int().min(5).max(100).catch(25),
	q: z.string().trim().max(40).optional().catch(undefined)
});
export type ListQueryInput = z.infer<typeof listQuerySchema>;
