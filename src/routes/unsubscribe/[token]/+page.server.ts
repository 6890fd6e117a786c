import { fail } from '@sveltejs/kit';
import { unsubscribeFromAdvice, verifyUnsubscribeToken } from '$lib/server/services/driver-advice';
import type { Actions, PageServerLoad } from './$types';

// Public on purpose: the signed token is the permission. Reading the page changes nothing
// (link scanners open links); only the button does.
export const load: PageServerLoad = ({ params }) => ({
	valid: verifyUnsubscribeToken(params.token) !== null
});

export const actions: Actions = {
	default: async ({ params }) => {
		if (!(await unsubscribeFromAdvice(params.token))) return fail(400, { done: false });
		return { done: true };
	}
};
