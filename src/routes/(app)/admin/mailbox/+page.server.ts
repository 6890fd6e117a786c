import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guards';
import { listDevMailbox } from '$lib/server/mail/dev-mailbox';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	requireRole('admin');
	const messages = await listDevMailbox();
	if (!messages)
		error(404, 'The development mailbox is only there while the local mail sink is in use.');
	return { messages };
};
