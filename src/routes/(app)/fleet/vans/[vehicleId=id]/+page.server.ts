import { redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guards';
import { orHttpError } from '$lib/server/http/errors';
import { parseForm } from '$lib/server/http/forms';
import { updateVehicleDetails } from '$lib/server/services/vehicles';
import { getVanStory } from '$lib/server/services/van-story';
import { listSensorTests } from '$lib/server/services/sensor-tests';
import { listVanVisits } from '$lib/server/services/visit-reports';
import { SERIES_KINDS, type SeriesKind } from '$lib/domain/series';
import { vehicleDetailsSchema } from '$lib/validation/vehicle';
import type { Actions, PageServerLoad } from './$types';

const seriesParam = (url: URL) => {
	const s = url.searchParams.get('series');
	return SERIES_KINDS.includes(s as SeriesKind) ? (s as SeriesKind) : undefined;
};

export const load: PageServerLoad = async ({ params, url }) => {
	const user = requireRole('fleet_manager');
	const vehicleId = Number(params.vehicleId);
	const [story, sensorTests, visits] = await orHttpError(() =>
		Promise.all([
			getVanStory(user, vehicleId, { series: seriesParam(url) }),
			listSensorTests(user, vehicleId),
			listVanVisits(user, vehicleId)
		])
	);
	return { story, sensorTests, visits, saved: url.searchParams.has('saved') };
};

export const actions: Actions = {
	save: async ({ params, request }) => {
		const user = requireRole('fleet_manager');
		const parsed = await parseForm(vehicleDetailsSchema, request);
		if (!parsed.ok) return parsed.failure;
		await orHttpError(() => updateVehicleDetails(user, Number(params.vehicleId), parsed.data));
		redirect(303, `/fleet/vans/${params.vehicleId}?saved`);
	}
};
