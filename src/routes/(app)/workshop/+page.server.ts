import { requireRole } from '$lib/server/auth/guards';
import { listVehicles } from '$lib/server/services/vehicles';
import { listQuerySchema } from '$lib/validation/vehicle';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const user = requireRole('workshop');
	const query = listQuerySchema.parse(Object.fromEntries(url.searchParams));
	return { list: await listVehicles(user, query), q: query.q ?? '' };
};
