import { requireUser } from '$lib/server/auth/guards';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = () => {
	const user = requireUser();
	// Only what the shell shows: no hashes, no ids beyond the person's own.
	return {
		user: { name: user.name, email: user.email, role: user.role, unitPreference: user.unitPreference, locale: user.locale, timeZone: user.timeZone }
	};
};
