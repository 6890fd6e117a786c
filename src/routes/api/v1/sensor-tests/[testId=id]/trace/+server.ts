import { json } from '@sveltejs/kit';
import { requireApiUser } from '$lib/server/auth/guards';
import { apiRespond, readQuery } from '$lib/server/http/api';
import { sensorTestTrace } from '$lib/server/services/sensor-tests';
import { traceQuerySchema } from '$lib/validation/sensor-tests';
import type { RequestHandler } from './$types';

/** About `points` min/max buckets of a static test's capture between `from` and `to` (s). */
export const GET: RequestHandler = ({ params, url }) =>
	apiRespond(async () => {
		const user = await requireApiUser('workshop', 'fleet_manager');
		const q = readQuery(url, traceQuerySchema);
		return json(
			await sensorTestTrace(user, Number(params.testId), {
				fromS: q.from,
				toS: q.to,
				points: q.points
			})
		);
	});
