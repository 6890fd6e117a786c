import { createHash } from 'node:crypto';
import { json } from '@sveltejs/kit';
import type { z } from 'zod';
import { config } from '../config';
import { PayloadTooLargeError } from '../services/errors';
import { apiError, apiErrorFrom } from './errors';
import { formatBytes } from '../storage';
import { idempotencyKeySchema } from '../../validation/telemetry';

/**
 * Runs an API handler: service errors (and the API guard's) become the API's error shape,
 * `{ error: { code, message, fields? } }`, with the matching status and headers.
 */
export async function apiRespond(work: () => Promise<Response>): Promise<Response> {
	try {
		return await work();
	} catch (err) {
		if (err instanceof BadRequestBody) return err.response;
		return apiErrorFrom(err);
	}
}

/** A body the route cannot use: answered as is. */
export class BadRequestBody extends Error {
	constructor(readonly response: Response) {
		super('Bad request body');
	}
}

/** A zod issue as the API reports it. */
export interface ApiIssue {
	path: (string | number)[];
	code: string;
	message: string;
}

export function issuesOf(error: z.ZodError): ApiIssue[] {
	return error.issues.map((i) => ({
		path: i.path.map((p) => (typeof p === 'symbol' ? String(p) : p)),
		code: i.code,
		message: i.message
	}));
}

/** 400 with the zod issues, plus `fields` keyed by dotted path (first message each). */
export function schemaErrorResponse(error: z.ZodError): Response {
	const issues = issuesOf(error);
	const fields: Record<string, string> = {};
	for (const issue of issues) fields[issue.path.join('.') || 'body'] ??= issue.message;
	const first = issues[0];
	const where = first && first.path.length ? `${first.path.join('.')}: ` : '';
	return json(
		{
			error: {
				code: 'invalid',
				message: `The request does not match the schema. ${where}${first?.message ?? ''}`.trim(),
				fields,
				issues
			}
		},
		{ status: 400 }
	);
}

/**
 * Reads a request body up to `maxBytes` without trusting Content-Length: the stream is
 * counted as it arrives. The rest of an oversized body is read and dropped so the client
 * still receives the 413 answer.
 * @throws PayloadTooLargeError
 */
export async function readBodyBytes(request: Request, maxBytes: number): Promise<Uint8Array> {
	if (!request.body) return new Uint8Array(0);
	const chunks: Uint8Array[] = [];
	let size = 0;
	let tooLarge = false;
	try {
		for await (const chunk of request.body as unknown as AsyncIterable<Uint8Array>) {
			size += chunk.byteLength;
			if (size > maxBytes) tooLarge = true;
			if (!tooLarge) chunks.push(chunk);
		}
	} catch (err) {
		// The adapter's own BODY_SIZE_LIMIT ends the stream with a 413 error of its own
		if ((err as { status?: number }).status === 413) tooLarge = true;
		else throw err;
	}
	if (tooLarge) {
		throw new PayloadTooLargeError(
			`The request body is larger than the ${formatBytes(maxBytes)} the API accepts; send fewer readings per request.`
		);
	}
	const out = new Uint8Array(size);
	let offset = 0;
	for (const c of chunks) {
		out.set(c, offset);
		offset += c.byteLength;
	}
	return out;
}

/**
 * Reads and validates a JSON body: 413 past `API_MAX_BODY_BYTES`, 400 `invalid_json` for
 * malformed JSON, 400 `invalid` with the zod issues for a schema mismatch.
 */
export async function readJson<S extends z.ZodType>(
	request: Request,
	schema: S,
	maxBytes = config.API_MAX_BODY_BYTES
): Promise<{ data: z.infer<S>; raw: Uint8Array }> {
	const raw = await readBodyBytes(request, maxBytes);
	let value: unknown;
	try {
		value = JSON.parse(new TextDecoder().decode(raw));
	} catch (err) {
		throw new BadRequestBody(
			apiError(400, 'invalid_json', `The body is not valid JSON: ${(err as Error).message}`)
		);
	}
	const parsed = schema.safeParse(value);
	if (!parsed.success) throw new BadRequestBody(schemaErrorResponse(parsed.error));
	return { data: parsed.data, raw };
}

/** Validates query parameters; a mismatch is a 400 with the zod issues. */
export function readQuery<S extends z.ZodType>(url: URL, schema: S): z.infer<S> {
	const parsed = schema.safeParse(Object.fromEntries(url.searchParams));
	if (!parsed.success) throw new BadRequestBody(schemaErrorResponse(parsed.error));
	return parsed.data;
}

/**
 * The request's `Idempotency-Key`, bound to this endpoint and a hash of the body; undefined
 * when the header is absent. A malformed key is a 400.
 */
export function idempotencyOf(
	request: Request,
	endpoint: string,
	body: Uint8Array
): { key: string; endpoint: string; requestHash: string } | undefined {
	const header = request.headers.get('idempotency-key');
	if (header === null) return undefined;
	const parsed = idempotencyKeySchema.safeParse(header.trim());
	if (!parsed.success)
		throw new BadRequestBody(
			apiError(400, 'invalid', parsed.error.issues[0].message, {
				'Idempotency-Key': parsed.error.issues[0].message
			})
		);
	return {
		key: parsed.data,
		endpoint,
		requestHash: createHash('sha256').update(body).digest('hex')
	};
}
