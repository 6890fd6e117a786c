/** Errors services throw; the route edge maps them to HTTP (see ../http/errors.ts). */
export class NotFoundError extends Error {
	constructor(what = 'That record') {
		super(`${what} was not found.`);
		this.name = 'NotFoundError';
	}
}

export class ForbiddenError extends Error {
	constructor(message = 'You are not allowed to do that.') {
		super(message);
		this.name = 'ForbiddenError';
	}
}

/** Input the person can correct; `fields` maps a field name to its message. */
export class ValidationError extends Error {
	constructor(
		message: string,
		readonly fields: Record<string, string> = {}
	) {
		super(message);
		this.name = 'ValidationError';
	}
}

export class TooManyAttemptsError extends Error {
	constructor(readonly retryAfterSeconds: number) {
		super('Too many sign-in attempts. Please try again later.');
		this.name = 'TooManyAttemptsError';
	}
}
