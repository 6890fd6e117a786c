import { json } from '@sveltejs/kit';
import { requireApiUser } from '$lib/server/auth/guards';
import { apiRespond } from '$lib/server/http/api';
import { undoImportBatch } from '$lib/server/services/imports';
import type { RequestHandler } from './$types';

/** Undoes an import or API batch: every row it stored is removed. */
export const DELETE: RequestHandler = ({ params }) =>
	apiRespond(async () => {
		const user = await requireApiUser('fleet_manager', 'workshop');
		return json(await undoImportBatch(user, Number(params.batchId)));
	});
