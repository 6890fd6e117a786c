import { requireRole } from '$lib/server/auth/guards';
import { boardSummary, visibleDepots } from '$lib/server/services/board';
import { workshopQueue } from '$lib/server/services/workshop-queue';
import { boardQuerySchema } from '$lib/validation/board';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const user = requireRole('workshop');
	const query = boardQuerySchema.parse(Object.fromEntries(url.searchParams));
	const now = new Date();
	const [queue, summary, depots] = await Promise.all([
		workshopQueue(user, query, now),
		boardSummary(user, query, now),
		visibleDepots(user)
	]);
	return { queue, summary, depots, status: query.status ?? null };
};
