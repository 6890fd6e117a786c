import { requireRole } from '$lib/server/auth/guards';
import { listBookings } from '$lib/server/services/bookings';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const user = requireRole('fleet_manager');
	return { bookings: await listBookings(user) };
};
