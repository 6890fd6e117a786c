/**
 * The import pages' loads and actions, shared by the fleet and workshop areas (each route calls
 * its guard first and passes the user in).
 */
import { error, fail, redirect } from '@sveltejs/kit';
import type { SessionUser } from '../auth/lucia';
import { readMultipart } from './multipart';
import { fieldErrors } from './forms';
import {
	ImportError,
	NotFoundError,
	PayloadTooLargeError,
	ValidationError,
	describeProblem
} from '../services/errors';
import {
	describeBatch,
	describeImport,
	listImportBatches,
	previewImport,
	runImport,
	stageImportFile,
	undoImportBatch
} from '../services/imports';
import { formId } from '../../validation/helpers';
import {
	IMPORT_KINDS,
	importKindQuerySchema,
	importSettingsSchema,
	settingsFromForm,
	type ImportKind
} from '../../validation/imports';
import { config } from '../config';
import { formatBytes } from '../storage';
import { orHttpError } from './errors';

export async function loadImportList(user: SessionUser, url: URL) {
	const importedId = Number(url.searchParams.get('imported'));
	let imported = null;
	if (Number.isInteger(importedId) && importedId > 0) {
		try {
			imported = await describeBatch(user, importedId);
		} catch (err) {
			if (!(err instanceof NotFoundError)) throw err;
		}
	}
	return {
		batches: await listImportBatches(user),
		imported,
		duplicates: Number(url.searchParams.get('duplicates') ?? 0) || 0,
		undone: Number(url.searchParams.get('undone') ?? 0) || null,
		limits: { maxSize: formatBytes(config.IMPORT_MAX_BYTES), maxRows: config.IMPORT_MAX_ROWS }
	};
}

/** `?/upload`: streams the file into storage, then opens the mapping step. */
export async function uploadAction(user: SessionUser, request: Request, base: string) {
	let staged;
	let fields: Record<string, string> = {};
	try {
		const read = await readMultipart(request, (file) => stageImportFile(user, file));
		fields = read.fields;
		staged = read.result;
	} catch (err) {
		if (err instanceof ValidationError || err instanceof PayloadTooLargeError) {
			return fail(err instanceof PayloadTooLargeError ? 413 : 400, {
				values: fields,
				errors: { file: err.message }
			});
		}
		throw err;
	}
	const kind = IMPORT_KINDS.includes(fields.kind as ImportKind) ? fields.kind : null;
	if (!kind) return fail(400, { values: fields, errors: { kind: 'Choose what the file holds' } });
	if (!staged)
		return fail(400, { values: fields, errors: { file: 'Choose a CSV file to upload' } });
	redirect(303, `${base}/imports/${staged.uploadId}?kind=${kind}`);
}

export async function undoAction(user: SessionUser, request: Request, base: string) {
	const form = await request.formData();
	const id = formId.safeParse(form.get('batchId'));
	if (!id.success) return fail(400, { errors: { form: 'That import was not found.' } });
	try {
		await undoImportBatch(user, id.data);
	} catch (err) {
		if (err instanceof ValidationError || err instanceof NotFoundError)
			return fail(400, { errors: { form: err.message } });
		throw err;
	}
	redirect(303, `${base}/imports?undone=${id.data}`);
}

export async function loadImportMapping(user: SessionUser, uploadId: number, url: URL) {
	const { kind } = importKindQuerySchema.parse(Object.fromEntries(url.searchParams));
	return { description: await orHttpError(() => describeImport(user, uploadId, kind)) };
}

async function readSettings(request: Request) {
	const form = await request.formData();
	const raw: Record<string, string> = {};
	for (const [key, value] of form.entries()) if (typeof value === 'string') raw[key] = value;
	return { raw, parsed: importSettingsSchema.safeParse(settingsFromForm(raw)) };
}

export async function previewAction(user: SessionUser, uploadId: number, request: Request) {
	const { raw, parsed } = await readSettings(request);
	if (!parsed.success) return fail(400, { values: raw, errors: fieldErrors(parsed.error) });
	try {
		const preview = await previewImport(user, uploadId, parsed.data);
		return {
			values: raw,
			preview: { rows: preview.rows, problems: preview.problems.map(describeProblem) }
		};
	} catch (err) {
		if (err instanceof ImportError)
			return fail(400, {
				values: raw,
				problems: err.problems.map(describeProblem),
				totalProblems: err.totalProblems
			});
		if (err instanceof ValidationError) return fail(400, { values: raw, errors: err.fields });
		// Another organisation's upload is answered like a missing one.
		if (err instanceof NotFoundError) error(404, err.message);
		throw err;
	}
}

export async function importAction(
	user: SessionUser,
	uploadId: number,
	request: Request,
	base: string
) {
	const { raw, parsed } = await readSettings(request);
	if (!parsed.success) return fail(400, { values: raw, errors: fieldErrors(parsed.error) });
	let result;
	try {
		result = await runImport(user, uploadId, parsed.data);
	} catch (err) {
		if (err instanceof ImportError)
			return fail(400, {
				values: raw,
				problems: err.problems.map(describeProblem),
				totalProblems: err.totalProblems
			});
		if (err instanceof ValidationError) return fail(400, { values: raw, errors: err.fields });
		// Another organisation's upload is answered like a missing one.
		if (err instanceof NotFoundError) error(404, err.message);
		throw err;
	}
	redirect(303, `${base}/imports?imported=${result.batchId}&duplicates=${result.duplicates.count}`);
}
