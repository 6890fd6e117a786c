import { json } from '@sveltejs/kit';
import { requireApiUser } from '$lib/server/auth/guards';
import { apiRespond, readQuery } from '$lib/server/http/api';
import { describeImport, listImportBatches, stageImportFile } from '$lib/server/services/imports';
import { stageQuerySchema } from '$lib/validation/imports';
import type { RequestHandler } from './$types';

/** Stores a CSV sent as the raw body (`Content-Type: text/csv`) and answers its layout. */
export const POST: RequestHandler = ({ request, url }) =>
	apiRespond(async () => {
		const user = await requireApiUser('fleet_manager', 'workshop');
		const query = readQuery(url, stageQuerySchema);
		const body = (request.body ?? []) as unknown as AsyncIterable<Uint8Array>;
		const staged = await stageImportFile(user, { fileName: query.fileName, body });
		return json(await describeImport(user, staged.uploadId, query.kind), { status: 201 });
	});

export const GET: RequestHandler = () =>
	apiRespond(async () => {
		const user = await requireApiUser('fleet_manager', 'workshop');
		return json({ items: await listImportBatches(user) });
	});
