import { z } from 'zod';
import { VAN_STATUSES } from '../domain/status';

export const BOARD_SORTS = ['urgency', 'registration', 'latest', 'crossing'] as const;

/** The risk board's query string: bad values fall back to defaults instead of failing. */
export const boardQuerySchema = z.object({
	page: z.coerce.number().int().min(1).max(100_000).catch(1),
	pageSize: z.coerce.number().int().min(5).max(100).catch(25),
	q: z.string().trim().max(40).optional().catch(undefined),
	status: z
		.enum([...VAN_STATUSES, 'not_forecast'])
		.optional()
		.catch(undefined),
	depot: z.coerce.number().int().positive().optional().catch(undefined),
	sort: z.enum(BOARD_SORTS).catch('urgency'),
	dir: z.enum(['asc', 'desc']).catch('asc')
});
export type BoardQueryInput = z.infer<typeof boardQuerySchema>;
