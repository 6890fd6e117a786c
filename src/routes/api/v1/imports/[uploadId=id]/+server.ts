import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { requireApiUser } from '$lib/server/auth/guards';
import { apiErrorFrom } from '$lib/server/http/errors';
import { apiRespond, readJson } from '$lib/server/http/api';
import { previewImport, runImport, type ImportProgress } from '$lib/server/services/imports';
import { importSettingsSchema } from '$lib/validation/imports';
import type { RequestHandler } from './$types';

const runSchema = z.intersection(
	importSettingsSchema,
	z.object({ preview: z.boolean().optional() })
);

/**
 * Checks and imports a staged file. With `Accept: application/x-ndjson` the answer streams
 * one JSON line per progress step, then `{"type":"done",…}` or `{"type":"error",…}`.
 */
export const POST: RequestHandler = ({ request, params }) =>
	apiRespond(async () => {
		const user = await requireApiUser('fleet_manager', 'workshop');
		const { data } = await readJson(request, runSchema);
		const uploadId = Number(params.uploadId);
		if (data.preview) return json(await previewImport(user, uploadId, data));
		if (!(request.headers.get('accept') ?? '').includes('application/x-ndjson')) {
			return json(await runImport(user, uploadId, data), { status: 201 });
		}
		const encoder = new TextEncoder();
		const stream = new ReadableStream<Uint8Array>({
			async start(controller) {
				const send = (value: unknown) =>
					controller.enqueue(encoder.encode(JSON.stringify(value) + '\n'));
				try {
					const result = await runImport(user, uploadId, data, new Date(), (p: ImportProgress) =>
						send({ type: 'progress', ...p })
					);
					send({ type: 'done', result });
				} catch (err) {
					try {
						const answer = apiErrorFrom(err);
						send({ type: 'error', status: answer.status, ...(await answer.json()) });
					} catch {
						console.error('[import]', err);
						send({
							type: 'error',
							status: 500,
							error: {
								code: 'server_error',
								message: 'Something went wrong on our side; nothing was imported.'
							}
						});
					}
				}
				controller.close();
			}
		});
		return new Response(stream, {
			headers: { 'content-type': 'application/x-ndjson', 'cache-control': 'no-store' }
		});
	});
