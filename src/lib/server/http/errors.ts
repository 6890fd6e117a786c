import { error, json } from '@sveltejs/kit';
import {
	ConflictError,
	ForbiddenError,
	ImportError,
	NotFoundError,
	PayloadTooLargeError,
	RateLimitedError,
	TooManyAttemptsError,
	UnauthorizedError,
	ValidationError
} from '../services/errors';

/**
 * Runs a service call and turns its named errors into HTTP answers. Another organisation's
 * record answers 404 like a missing one, so ids leak nothing.
 */
export async function orHttpError<T>(work: () => Promise<T>): Promise<T> {
	try {
		return await work();
	} catch (err) {
		if (err instanceof NotFoundError) error(404, err.message);
		if (err instanceof ForbiddenError) error(403, err.message);
		if (err instanceof ValidationError) error(400, err.message);
		if (err instanceof ImportError) error(400, err.message);
		if (err instanceof PayloadTooLargeError) error(413, err.message);
		if (err instanceof ConflictError) error(409, err.message);
		throw err;
	}
}

/** The API's one error shape: `{ error: { code, message, fields? } }`. */
export function apiError(
	status: number,
	code: string,
	message: string,
	fields?: Record<string, string>
) {
	return json({ error: { code, message, ...(fields ? { fields } : {}) } }, { status });
}

export function apiErrorFrom(err: unknown) {
	if (err instanceof NotFoundError) return apiError(404, 'not_found', err.message);
	if (err instanceof ForbiddenError) return apiError(403, 'forbidden', err.message);
	if (err instanceof ValidationError) return apiError(400, 'invalid', err.message, err.fields);
	if (err instanceof TooManyAttemptsError) return apiError(429, 'too_many', err.message);
	if (err instanceof UnauthorizedError) return apiError(401, 'unauthorized', err.message);
	if (err instanceof PayloadTooLargeError) return apiError(413, 'too_large', err.message);
	if (err instanceof ConflictError) return apiError(409, 'conflict', err.message);
	if (err instanceof RateLimitedError) {
		const res = apiError(429, 'rate_limited', err.message);
		res.headers.set('retry-after', String(err.retryAfterSeconds));
		return res;
	}
	if (err instanceof ImportError) {
		return json(
			{
				error: {
					code: 'import_invalid',
					message: err.message,
					problems: err.problems,
					totalProblems: err.totalProblems
				}
			},
			{ status: 400 }
		);
	}
	throw err;
}
