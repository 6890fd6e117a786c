import { z } from 'zod';

/** A trimmed form string; empty becomes undefined so optional fields really are optional. */
export const optionalText = (max: number, label: string) =>
	z.preprocess(
		(v) =>
			typeof v === 'string' && v.trim() === '' ? undefined : typeof v === 'string' ? v.trim() : v,
		z.string().max(max, `${label} must be at most ${max} characters`).optional()
	);

export const requiredText = (max: number, label: string) =>
	z.preprocess(
		(v) => (typeof v === 'string' ? v.trim() : v),
		z
			.string({ error: `${label} is required` })
			.min(1, `${label} is required`)
			.max(max, `${label} must be at most ${max} characters`)
	);

/** A number typed into a form: accepts a decimal comma, rejects words. */
export const formNumber = (label: string, min: number, max: number, unit = '') =>
	z.preprocess(
		(v) =>
			typeof v === 'string'
				? v.trim() === ''
					? undefined
					: Number(v.trim().replace(',', '.'))
				: v,
		z
			.number({ error: `${label} must be a number` })
			.refine((n) => Number.isFinite(n), `${label} must be a number`)
			.refine(
				(n) => n >= min && n <= max,
				`${label} must be between ${min} and ${max}${unit ? ' ' + unit : ''}`
			)
	);

export const optionalFormNumber = (label: string, min: number, max: number, unit = '') =>
	formNumber(label, min, max, unit).optional();

export const formId = z.coerce.number().int().positive();
