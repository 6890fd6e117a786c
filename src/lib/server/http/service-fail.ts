import { fail } from '@sveltejs/kit';
import { ValidationError } from '../services/errors';
import { orHttpError } from './errors';

/**
 * Runs a service call from a form action. A ValidationError becomes `fail(400, { values,
 * errors, message })` for the page to show beside the fields; other service errors map as in
 * `orHttpError`.
 */
export async function orFormFailure<T>(values: Record<string, string>, work: () => Promise<T>) {
	let refused: ValidationError | null = null;
	const value = await orHttpError(async () => {
		try {
			return await work();
		} catch (err) {
			if (err instanceof ValidationError) {
				refused = err;
				return null;
			}
			throw err;
		}
	});
	if (refused) {
		const { fields, message } = refused as ValidationError;
		return { ok: false as const, failure: fail(400, { values, errors: fields, message }) };
	}
	return { ok: true as const, value: value as T };
}
