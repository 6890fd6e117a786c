import { redirect } from '@sveltejs/kit';
import { HOME_BY_ROLE } from '$lib/server/auth/guards';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals }) => {
	redirect(303, locals.user ? HOME_BY_ROLE[locals.user.role] : '/login');
};
