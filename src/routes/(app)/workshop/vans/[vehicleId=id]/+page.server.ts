import { requireRole } from '$lib/server/auth/guards';
import { orHttpError } from '$lib/server/http/errors';
import { getVehicleStory } from '$lib/server/services/vehicles';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const user = requireRole('workshop');
	return { story: await orHttpError(() => getVehicleStory(user, Number(params.vehicleId))) };
};
