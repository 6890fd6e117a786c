import { requireRole } from '$lib/server/auth/guards';
import { listDriverVans } from '$lib/server/services/driver';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const user = requireRole('driver');
	return { vans: await listDriverVans(user) };
};
