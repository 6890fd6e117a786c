import { redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/auth/guards';
import { parseForm } from '$lib/server/http/forms';
import { getOwnSettings, updateOwnSettings } from '$lib/server/services/account';
import { unitPreferenceSchema } from '$lib/validation/vehicle';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const user = requireUser();
	return { saved: url.searchParams.has('saved'), settings: await getOwnSettings(user) };
};

export const actions: Actions = {
	save: async ({ request }) => {
		const user = requireUser();
		const parsed = await parseForm(unitPreferenceSchema, request);
		if (!parsed.ok) return parsed.failure;
		await updateOwnSettings(user, parsed.data);
		redirect(303, '/settings?saved');
	}
};
