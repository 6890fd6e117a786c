import { z } from 'zod';
import { VAN_STATUSES } from '../domain/status';
import { OPEN_BOOKING_STATES } from '../domain/visits';

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

const instant = z.string().nullable().describe('ISO 8601 instant, or null');

/** One row of `GET /api/v1/board` (the answer's shape, documented in the OpenAPI description). */
export const boardRowSchema = z.object({
	id: z.number().int(),
	registration: z.string(),
	makeModel: z.string().nullable(),
	fleet: z.string().nullable(),
	depot: z.string().nullable(),
	status: z.enum(VAN_STATUSES).nullable().describe('null: not forecast yet'),
	confidence: z.string().nullable(),
	latestMbar: z.number().nullable(),
	concernLineMbar: z.number().nullable(),
	growthMbarPerWeek: z.number().nullable(),
	crossingEarliest: instant,
	crossingExpected: instant,
	crossingLatest: instant,
	openVisit: z
		.object({ id: z.number().int(), state: z.enum(OPEN_BOOKING_STATES) })
		.nullable()
		.describe(
			"The van's visit that is requested, proposed or confirmed (a workshop sees only its own), or null"
		),
	suggestedVisitBy: instant.describe(
		'End of the suggested visit window: the day before the earliest forecast crossing, at most four weeks ahead; null when no crossing is forecast and the van is not over the line'
	),
	visitUrgent: z
		.boolean()
		.describe(
			'True when the van should come in as soon as possible: over the line, or its earliest crossing too close for a three-day window to end before it'
		)
});
export type BoardRow = z.output<typeof boardRowSchema>;

export const boardPageSchema = z.object({
	items: z.array(boardRowSchema),
	total: z.number().int(),
	page: z.number().int(),
	pageSize: z.number().int()
});
