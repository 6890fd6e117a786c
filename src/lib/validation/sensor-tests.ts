import { z } from 'zod';
import { PRESSURE_UNITS } from '../domain/vocabulary';
import { STATIC_PHASES } from '../domain/capture/phases';

const blankToUndefined = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);
const formNumber = (label: string) =>
	z.preprocess(
		(v) =>
			typeof v === 'string'
				? v.trim() === ''
					? undefined
					: Number(v.trim().replace(',', '.'))
				: v,
		z
			.number({ error: `${label} must be a number` })
			.refine(Number.isFinite, `${label} must be a number`)
	);
const optionalId = z.preprocess(blankToUndefined, z.coerce.number().int().positive().optional());
const optionalDateTime = z.preprocess(
	(v) => (typeof v === 'string' && v.trim() !== '' ? new Date(v) : undefined),
	z
		.date()
		.refine((d) => !Number.isNaN(d.getTime()), 'Enter a valid date and time')
		.optional()
);

/** Options sent with a capture upload (form fields or query parameters). */
export const captureOptionsSchema = z.object({
	sensorTypeId: optionalId,
	testedAt: optionalDateTime
});
export type CaptureOptionsInput = z.infer<typeof captureOptionsSchema>;

export const captureQuerySchema = captureOptionsSchema.extend({
	fileName: z.string().trim().min(1).max(255).default('capture.csv')
});

export const vacuumStepSchema = z.object({
	applied: z.number().min(0, 'The vacuum must be 0 or more').max(1500),
	unit: z.enum(PRESSURE_UNITS),
	measuredVolts: z.number().min(0, 'Volts must be 0 or more').max(10, 'Volts must be at most 10')
});

export const vacuumCheckSchema = z.object({
	steps: z
		.array(vacuumStepSchema)
		.min(1, 'Enter at least one step: the vacuum applied and the voltage read'),
	sensorTypeId: optionalId,
	testedAt: optionalDateTime
});
export type VacuumCheckInput = z.infer<typeof vacuumCheckSchema>;

/** Most rows the vacuum step form offers. */
export const VACUUM_FORM_ROWS = 10;

/** Reads the step table form (`applied.0`, `unit.0`, `volts.0` …); blank rows are skipped. */
export function vacuumFromForm(raw: Record<string, string>): {
	input: unknown;
	errors: Record<string, string>;
} {
	const steps: unknown[] = [];
	const errors: Record<string, string> = {};
	for (let i = 0; i < VACUUM_FORM_ROWS; i++) {
		const applied = raw[`applied.${i}`]?.trim() ?? '';
		const volts = raw[`volts.${i}`]?.trim() ?? '';
		if (applied === '' && volts === '') continue;
		const a = formNumber('Vacuum').safeParse(applied);
		const v = formNumber('Volts').safeParse(volts);
		if (!a.success) errors[`applied.${i}`] = `Step ${i + 1}: enter the vacuum applied as a number`;
		if (!v.success) errors[`volts.${i}`] = `Step ${i + 1}: enter the voltage read as a number`;
		if (a.success && v.success)
			steps.push({ applied: a.data, unit: raw[`unit.${i}`] || 'inHg', measuredVolts: v.data });
	}
	return { input: { steps, sensorTypeId: raw.sensorTypeId, testedAt: raw.testedAt }, errors };
}

const spanField = (label: string) =>
	z.preprocess(
		(v) =>
			typeof v === 'string'
				? v.trim() === ''
					? undefined
					: Number(v.trim().replace(',', '.'))
				: v,
		z
			.number({ error: `${label} must be a number of seconds` })
			.min(0, `${label} must be 0 s or more`)
			.optional()
	);

/** Phase spans typed by the technician: `<phase>.startS` / `<phase>.endS`, blank = no phase. */
export const phasesFormSchema = z
	.object(
		Object.fromEntries(
			STATIC_PHASES.flatMap((p) => [
				[`${p}.startS`, spanField('Start')],
				[`${p}.endS`, spanField('End')]
			])
		) as Record<string, ReturnType<typeof spanField>>
	)
	.superRefine((v, ctx) => {
		for (const p of STATIC_PHASES) {
			const s = v[`${p}.startS`];
			const e = v[`${p}.endS`];
			if ((s === undefined) !== (e === undefined))
				ctx.addIssue({
					code: 'custom',
					path: [`${p}.endS`],
					message: 'Give both the start and the end, or neither'
				});
			else if (s !== undefined && e !== undefined && e <= s)
				ctx.addIssue({
					code: 'custom',
					path: [`${p}.endS`],
					message: 'The end must come after the start'
				});
		}
	});

export const traceQuerySchema = z.object({
	from: z.coerce.number().finite().optional(),
	to: z.coerce.number().finite().optional(),
	points: z.coerce.number().int().min(10).max(4000).default(800)
});
