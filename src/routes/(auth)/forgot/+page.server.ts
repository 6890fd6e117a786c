import { redirect } from '@sveltejs/kit';
import { parseForm } from '$lib/server/http/forms';
import { requestPasswordReset } from '$lib/server/services/accounts';
import { resetRequestSchema } from '$lib/validation/account';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ url }) => ({ sent: url.searchParams.has('sent') });

export const actions: Actions = {
	default: async ({ request }) => {
		const parsed = await parseForm(resetRequestSchema, request);
		if (!parsed.ok) return parsed.failure;
		await requestPasswordReset(parsed.data.email);
		redirect(303, '/forgot?sent');
	}
};
