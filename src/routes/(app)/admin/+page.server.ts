import { requireRole } from '$lib/server/auth/guards';
import { getAdminOverview } from '$lib/server/services/admin';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const user = requireRole('admin');
	return { overview: await getAdminOverview(user) };
};
