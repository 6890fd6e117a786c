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

/** No credentials, or a token that is unknown or revoked (401). */
export class UnauthorizedError extends Error {
	constructor(message = 'Sign in or send a valid API token.') {
		super(message);
		this.name = 'UnauthorizedError';
	}
}

/** An API token spent its request allowance (429 with Retry-After). */
export class RateLimitedError extends Error {
	constructor(readonly retryAfterSeconds: number) {
		super(`Too many requests with this token. Try again in ${retryAfterSeconds} s.`);
		this.name = 'RateLimitedError';
	}
}

/** A body or file larger than allowed (413). */
export class PayloadTooLargeError extends Error {
	constructor(message: string) {
		super(message);
		this.name = 'PayloadTooLargeError';
	}
}

/** The request clashes with an earlier one, e.g. an Idempotency-Key reused for another body (409). */
export class ConflictError extends Error {
	constructor(message: string) {
		super(message);
		this.name = 'ConflictError';
	}
}

/** One problem in an uploaded file, pointing at its 1-based line and column. */
export interface FileProblem {
	line: number;
	column: number;
	/** The column's header name, when the file has one. */
	columnName?: string;
	message: string;
}

/** A file that cannot be imported; nothing was stored. `message` names the first problem. */
export class ImportError extends Error {
	constructor(
		readonly problems: FileProblem[],
		readonly totalProblems = problems.length
	) {
		super(problems.length ? describeProblem(problems[0]) : 'The file cannot be imported.');
		this.name = 'ImportError';
	}
}

export function describeProblem(p: FileProblem): string {
	const where =
		p.line > 0
			? `Line ${p.line}, column ${p.column}${p.columnName ? ` (${p.columnName})` : ''}: `
			: '';
	return `${where}${p.message}`;
}
