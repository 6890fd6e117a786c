import { requireUser } from '$lib/server/auth/guards';
import { devMailboxDir } from '$lib/server/mail/dev-mailbox';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = () => {
	const user = requireUser();
	// Only what the shell shows: no hashes, no ids beyond the person's own.
	return {
		devMailbox: user.role === 'admin' && devMailboxDir() !== null,
		user: {
			name: user.name,
			email: user.email,
			role: user.role,
			unitPreference: user.unitPreference,
			locale: user.locale,
			timeZone: user.timeZone
		}
	};
};
