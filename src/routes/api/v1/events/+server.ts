import { json } from '@sveltejs/kit';
import { requireApiUser } from '$lib/server/auth/guards';
import { apiRespond, idempotencyOf, readJson } from '$lib/server/http/api';
import { recordEventBatch } from '$lib/server/services/telemetry';
import { eventsBatchSchema } from '$lib/validation/telemetry';
import type { RequestHandler } from './$types';

export const POST: RequestHandler = ({ request }) =>
	apiRespond(async () => {
		const user = await requireApiUser('fleet_manager', 'workshop');
		const { data, raw } = await readJson(request, eventsBatchSchema);
		const answer = await recordEventBatch(
			user,
			data,
			idempotencyOf(request, 'POST /api/v1/events', raw)
		);
		return json(answer.body, {
			status: answer.status,
			headers: answer.replayed ? { 'idempotent-replayed': 'true' } : {}
		});
	});
