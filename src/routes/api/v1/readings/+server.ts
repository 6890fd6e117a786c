import { json } from '@sveltejs/kit';
import { requireApiUser } from '$lib/server/auth/guards';
import { apiRespond, idempotencyOf, readJson } from '$lib/server/http/api';
import { recordReadingBatch } from '$lib/server/services/telemetry';
import { readingsBatchSchema } from '$lib/validation/telemetry';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = ({ request }) =>
	apiRespond(async () => {
		const user = await requireApiUser('fleet_manager', 'workshop');
		const { data, raw } = await readJson(request, readingsBatchSchema);
		const answer = await recordReadingBatch(
			user,
			data,
			idempotencyOf(request, 'POST /api/v1/readings', raw)
		);
		return json(answer.body, {
			status: answer.status,
			headers: answer.replayed ? { 'idempotent-replayed': 'true' } : {}
		});
	});
