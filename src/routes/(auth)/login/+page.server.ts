import { fail, redirect } from '@sveltejs/kit';
import { lucia } from '$lib/server/auth/lucia';
import { HOME_BY_ROLE } from '$lib/server/auth/guards';
import { parseForm, type FieldErrors } from '$lib/server/http/forms';
import { checkCredentials } from '$lib/server/services/sign-in';
import { TooManyAttemptsError } from '$lib/server/services/errors';
import { User } from '$lib/server/db';
import { safeRedirect, signInSchema } from '$lib/validation/auth';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals, url }) => {
	if (locals.user) redirect(303, HOME_BY_ROLE[locals.user.role]);
	return {
		redirectTo: safeRedirect(url.searchParams.get('redirectTo')),
		passwordSet: url.searchParams.get('password') === 'set'
	};
};

export const actions: Actions = {
	default: async ({ request, cookies, getClientAddress }) => {
		const parsed = await parseForm(signInSchema, request);
		if (!parsed.ok) return parsed.failure;
		const { email, password, redirectTo } = parsed.data;
		let userId: number | null;
		try {
			userId = await checkCredentials({ email, password, address: getClientAddress() });
		} catch (err) {
			if (err instanceof TooManyAttemptsError) {
				return fail(429, {
					values: { email },
					errors: {} as FieldErrors,
					message: 'Too many failed sign-ins. Please try again later (in about 15 minutes).'
				});
			}
			throw err;
		}
		if (userId === null) {
			return fail(400, {
				values: { email },
				errors: {} as FieldErrors,
				message: 'That e-mail and password do not match an account.'
			});
		}
		const session = await lucia.createSession(userId, {});
		const cookie = lucia.createSessionCookie(session.id);
		cookies.set(cookie.name, cookie.value, { path: '.', ...cookie.attributes });
		const user = await User.findByPk(userId, { attributes: ['role'] });
		redirect(303, safeRedirect(redirectTo) ?? HOME_BY_ROLE[user!.role]);
	}
};
