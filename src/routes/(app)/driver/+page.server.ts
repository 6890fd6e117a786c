import { requireRole } from '$lib/server/auth/guards';
import { listDriverVans } from '$lib/server/services/driver';
import { adviceForDriver } from '$lib/server/services/driver-advice';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const user = requireRole('driver');
	const now = new Date();
	const [vans, advice] = await Promise.all([
		listDriverVans(user, now),
		adviceForDriver(user.id, now)
	]);
	return {
		vans: vans.map((v) => {
			const a = advice.find((x) => x.vehicleId === v.id);
			return {
				...v,
				advice: a?.items.map((i) => ({ text: i.text, restsOn: i.restsOn })) ?? [],
				week: a
					? {
							trips: a.usage.weeks.at(-1)?.trips ?? 0,
							shortTrips: a.usage.weeks.at(-1)?.shortTrips ?? 0,
							regenCapable: a.usage.weeks.at(-1)?.regenCapableDrives ?? 0,
							idleShare: a.usage.idleShare,
							kmPerDay: a.usage.kmPerDay
						}
					: null
			};
		})
	};
};
