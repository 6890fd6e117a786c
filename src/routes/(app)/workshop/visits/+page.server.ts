import { requireRole } from '$lib/server/auth/guards';
import { orHttpError } from '$lib/server/http/errors';
import {
	getCapacity,
	mondayOf,
	waitingBookings,
	workshopWeek
} from '$lib/server/services/bookings';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const user = requireRole('workshop');
	const asked = url.searchParams.get('week');
	const capacity = await orHttpError(() => getCapacity(user.organisationId));
	const monday =
		asked && /^\d{4}-\d{2}-\d{2}$/.test(asked) && !Number.isNaN(Date.parse(asked))
			? mondayOf(new Date(`${asked}T12:00:00Z`), 'UTC')
			: mondayOf(new Date(), capacity.timeZone);
	const [week, waiting] = await Promise.all([workshopWeek(user, monday), waitingBookings(user)]);
	const shift = (days: number) =>
		new Date(Date.parse(`${monday}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);
	return { week, waiting, monday, previous: shift(-7), next: shift(7) };
};
