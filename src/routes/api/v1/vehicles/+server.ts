import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guards';
import { listVehicles } from '$lib/server/services/vehicles';
import { listQuerySchema } from '$lib/validation/vehicle';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async ({ url }) => {
	const user = requireRole('fleet_manager', 'workshop', 'driver');
	const query = listQuerySchema.parse(Object.fromEntries(url.searchParams));
	return json(await listVehicles(user, query));
};
