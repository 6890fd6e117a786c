import { requireRole } from '$lib/server/auth/guards';
import { orHttpError } from '$lib/server/http/errors';
import { getVisitReport } from '$lib/server/services/visit-reports';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const user = requireRole('fleet_manager');
	return { report: await orHttpError(() => getVisitReport(user, Number(params.reportId))) };
};
