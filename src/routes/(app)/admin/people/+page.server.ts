import { requireRole } from '$lib/server/auth/guards';
import { handleInvite } from '$lib/server/http/invite-action';
import { getAdminOverview } from '$lib/server/services/admin';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const user = requireRole('admin');
	const overview = await getAdminOverview(user);
	return {
		organisations: overview.organisations.map((o) => ({ id: o.id, name: o.name })),
		invited: url.searchParams.get('invited')
	};
};

export const actions: Actions = {
	invite: async (event) => handleInvite(requireRole('admin'), event, '/admin/people')
};
