import { fail, type ActionFailure } from '@sveltejs/kit';
import type { SessionUser } from '../auth/lucia';
import { MAX_ATTACHMENTS_PER_REPORT } from '../../attachments';
import { PayloadTooLargeError, ValidationError } from '../services/errors';
import {
	discardStored,
	storeAttachment,
	tooManyAtOnce,
	type StoredAttachment
} from '../services/visit-report-attachments';
import { readFormWithFiles, type FormFields } from './multipart';

type Read =
	| { ok: true; fields: FormFields; files: StoredAttachment[] }
	| {
			ok: false;
			failure: ActionFailure<{ values: Record<string, string>; errors: Record<string, string> }>;
	  };

/**
 * Reads a form with photo/PDF files in its `attachments` input, streaming each file to storage.
 * A refused file (wrong content, too large, too many) becomes a form failure naming it, and the
 * files already written are removed: the caller then holds either every file or none.
 */
export async function readAttachmentForm(user: SessionUser, request: Request): Promise<Read> {
	const read = await readFormWithFiles(request, (file) => storeAttachment(user, file), {
		maxFiles: MAX_ATTACHMENTS_PER_REPORT,
		tooMany: tooManyAtOnce
	});
	if (!read.failure) return { ok: true, fields: read.fields, files: read.results };
	await discardStored(read.results);
	const err = read.failure;
	if (!(err instanceof ValidationError || err instanceof PayloadTooLargeError)) throw err;
	const values = Object.fromEntries(
		Object.entries(read.fields).map(([k, v]) => [k, Array.isArray(v) ? v.join(',') : v])
	);
	return {
		ok: false,
		failure: fail(err instanceof PayloadTooLargeError ? 413 : 400, {
			values,
			errors: { attachments: err.message }
		})
	};
}
