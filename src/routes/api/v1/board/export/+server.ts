import { requireRole } from '$lib/server/auth/guards';
import { exportBoardCsv } from '$lib/server/services/board-export';
import { boardQuerySchema } from '$lib/validation/board';
import type { RequestHandler } from './$types';

/** The current view of the board (filters and sort, every page) as a CSV file. */
export const GET: RequestHandler = async ({ url }) => {
	const user = requireRole('fleet_manager', 'workshop');
	const query = boardQuerySchema.parse(Object.fromEntries(url.searchParams));
	const csv = await exportBoardCsv(user, query);
	const stamp = new Date().toISOString().slice(0, 10);
	return new Response(csv, {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="sootcast-vans-${stamp}.csv"`
		}
	});
};
