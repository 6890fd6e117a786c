import { fail, redirect } from '@sveltejs/kit';
import { parseForm, type FieldErrors } from '$lib/server/http/forms';
import { DEAD_LINK_MESSAGE, peekActionToken } from '$lib/server/services/account-links';
import { setPasswordWithLink } from '$lib/server/services/accounts';
import { ValidationError } from '$lib/server/services/errors';
import { newPasswordSchema } from '$lib/validation/account';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const person = await peekActionToken(params.token, 'invite');
	return person ? { valid: true as const, name: person.name, email: person.email } : { valid: false as const, message: DEAD_LINK_MESSAGE };
};

export const actions: Actions = {
	default: async ({ request, params }) => {
		const parsed = await parseForm(newPasswordSchema, request);
		if (!parsed.ok) return parsed.failure;
		try {
			await setPasswordWithLink(params.token, 'invite', parsed.data.password);
		} catch (err) {
			if (err instanceof ValidationError) return fail(400, { errors: {} as FieldErrors, message: err.message });
			throw err;
		}
		redirect(303, '/login?password=set');
	}
};
