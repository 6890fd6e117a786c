import { requireRole } from '$lib/server/auth/guards';
import { handleInvite } from '$lib/server/http/invite-action';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ url }) => {
	requireRole('fleet_manager');
	return { invited: url.searchParams.get('invited') };
};

export const actions: Actions = {
	invite: async (event) => handleInvite(requireRole('fleet_manager'), event, '/fleet/people')
};
