import { requireRole } from '$lib/server/auth/guards';
import { orHttpError } from '$lib/server/http/errors';
import { getVanStory } from '$lib/server/services/van-story';
import { listSensorTests } from '$lib/server/services/sensor-tests';
import { listVanVisits } from '$lib/server/services/visit-reports';
import { SERIES_KINDS, type SeriesKind } from '$lib/domain/series';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params, url }) => {
	const user = requireRole('workshop');
	const vehicleId = Number(params.vehicleId);
	const series = url.searchParams.get('series');
	const [story, sensorTests, visits] = await orHttpError(() =>
		Promise.all([
			getVanStory(user, vehicleId, {
				series: SERIES_KINDS.includes(series as SeriesKind) ? (series as SeriesKind) : undefined
			}),
			listSensorTests(user, vehicleId),
			listVanVisits(user, vehicleId)
		])
	);
	return { story, sensorTests, visits };
};
