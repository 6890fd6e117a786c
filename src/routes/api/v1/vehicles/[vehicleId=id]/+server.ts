import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guards';
import { apiErrorFrom } from '$lib/server/http/errors';
import { getVehicleStory } from '$lib/server/services/vehicles';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ params }) => {
	const user = requireRole('fleet_manager', 'workshop', 'driver');
	try {
		return json(await getVehicleStory(user, Number(params.vehicleId)));
	} catch (err) {
		return apiErrorFrom(err);
	}
};
