import { fail, redirect, type RequestEvent } from '@sveltejs/kit';
import type { SessionUser } from '../auth/lucia';
import { parseForm } from './forms';
import { invitePerson } from '../services/accounts';
import { ForbiddenError, ValidationError } from '../services/errors';
import { inviteSchema } from '../../validation/account';

/** The invite action shared by the admin and fleet pages; the caller has run the guard. */
export async function handleInvite(user: SessionUser, event: RequestEvent, back: string) {
	const parsed = await parseForm(inviteSchema, event.request);
	if (!parsed.ok) return parsed.failure;
	try {
		const invited = await invitePerson(user, parsed.data);
		redirect(303, `${back}?invited=${encodeURIComponent(invited.email)}`);
	} catch (err) {
		if (err instanceof ValidationError || err instanceof ForbiddenError) {
			const fields = err instanceof ValidationError ? err.fields : {};
			return fail(400, { values: parsed.values, errors: fields, message: err.message });
		}
		throw err;
	}
}
