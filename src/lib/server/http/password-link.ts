import { fail, redirect, type RequestEvent } from '@sveltejs/kit';
import { parseForm, type FieldErrors } from './forms';
import { DEAD_LINK_MESSAGE, peekActionToken } from '../services/account-links';
import { setPasswordWithLink } from '../services/accounts';
import { ValidationError } from '../services/errors';
import { newPasswordSchema } from '../../validation/account';

type Purpose = 'invite' | 'reset';

/** The welcome and reset pages differ only in their purpose: one load and one action for both. */
export async function loadPasswordLink(token: string, purpose: Purpose) {
	const person = await peekActionToken(token, purpose);
	return person
		? { valid: true as const, name: person.name, email: person.email }
		: { valid: false as const, message: DEAD_LINK_MESSAGE };
}

export async function setPasswordFromLink(
	event: RequestEvent<{ token: string }>,
	purpose: Purpose
) {
	const parsed = await parseForm(newPasswordSchema, event.request);
	if (!parsed.ok) return parsed.failure;
	try {
		await setPasswordWithLink(event.params.token, purpose, parsed.data.password);
	} catch (err) {
		if (err instanceof ValidationError)
			return fail(400, { errors: {} as FieldErrors, message: err.message });
		throw err;
	}
	redirect(303, '/login?password=set');
}
