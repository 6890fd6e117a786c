import { fail, type ActionFailure } from '@sveltejs/kit';
import type { z } from 'zod';

export type FieldErrors = Record<string, string>;

/** First message per field, keyed by the field's dotted path. */
export function fieldErrors(error: z.ZodError): FieldErrors {
	const out: FieldErrors = {};
	for (const issue of error.issues) {
		const key = issue.path.join('.') || 'form';
		out[key] ??= issue.message;
	}
	return out;
}

const SECRET_FIELDS = /password|token/i;

type Parsed<T> =
	| { ok: true; data: T; values: Record<string, string> }
	| { ok: false; failure: ActionFailure<{ values: Record<string, string>; errors: FieldErrors }> };

/**
 * Reads a form post through a zod schema. On rejection, the failure echoes what was typed
 * (never secrets) with one message per field, ready for `return parsed.failure`.
 */
export async function parseForm<S extends z.ZodType>(
	schema: S,
	request: Request
): Promise<Parsed<z.infer<S>>> {
	const form = await request.formData();
	// A key sent once is a string; sent several times (checkbox groups) it is an array.
	const raw: Record<string, string | string[]> = {};
	for (const [key, value] of form.entries()) {
		if (typeof value !== 'string') continue;
		const seen = raw[key];
		raw[key] = seen === undefined ? value : Array.isArray(seen) ? [...seen, value] : [seen, value];
	}
	return parseFields(schema, raw);
}

/** `parseForm` for fields already read (a multipart post read as a stream). */
export function parseFields<S extends z.ZodType>(
	schema: S,
	raw: Record<string, string | string[]>
): Parsed<z.infer<S>> {
	const values = Object.fromEntries(
		Object.entries(raw)
			.filter(([k]) => !SECRET_FIELDS.test(k))
			.map(([k, v]) => [k, Array.isArray(v) ? v.join(',') : v])
	);
	const result = schema.safeParse(raw);
	if (!result.success) {
		return { ok: false, failure: fail(400, { values, errors: fieldErrors(result.error) }) };
	}
	return { ok: true, data: result.data, values };
}
