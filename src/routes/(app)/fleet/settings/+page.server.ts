import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guards';
import { orHttpError } from '$lib/server/http/errors';
import { parseForm } from '$lib/server/http/forms';
import { createApiToken, listApiTokens, revokeApiToken } from '$lib/server/services/api-tokens';
import { apiTokenNameSchema } from '$lib/validation/api-tokens';
import { formId } from '$lib/validation/helpers';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const user = requireRole('fleet_manager');
	return { tokens: await listApiTokens(user), revoked: url.searchParams.has('revoked') };
};

export const actions: Actions = {
	// No redirect after creating: the token is shown this once, and must not travel in a URL.
	create: async ({ request }) => {
		const user = requireRole('fleet_manager');
		const parsed = await parseForm(apiTokenNameSchema, request);
		if (!parsed.ok) return parsed.failure;
		const { token, apiToken } = await createApiToken(user, parsed.data);
		return { created: { token, name: apiToken.name } };
	},
	revoke: async ({ request }) => {
		const user = requireRole('fleet_manager');
		const id = formId.safeParse((await request.formData()).get('tokenId'));
		if (!id.success) return fail(400, { errors: { form: 'That token was not found.' } });
		await orHttpError(() => revokeApiToken(user, id.data));
		redirect(303, '/fleet/settings?revoked');
	}
};
