import { requireRole } from '$lib/server/auth/guards';
import { listJobRuns } from '$lib/server/services/job-runs';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const user = requireRole('admin');
	return { runs: await listJobRuns(user) };
};
