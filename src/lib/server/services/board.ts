import { Op, fn, col, type Order, type WhereOptions } from 'sequelize';
import { Booking, Depot, Organisation, Vehicle, VehicleStatus } from '../db';
import type { SessionUser } from '../auth/lucia';
import type { BoardQueryInput, BoardRow } from '../../validation/board';
import { VAN_STATUSES, type VanStatus } from '../../domain/status';
import {
	OPEN_BOOKING_STATES,
	suggestedVisitWindow,
	type OpenBookingState
} from '../../domain/visits';
import { vehicleScope } from './scope';

export type { BoardRow };

const NOT_FORECAST_URGENCY = 9_999_999;
const iso = (d: Date | string | null | undefined) => (d ? new Date(d).toISOString() : null);

async function scopedWhere(
	user: SessionUser,
	query: Pick<BoardQueryInput, 'q' | 'depot'>
): Promise<WhereOptions<Vehicle>> {
	const parts: WhereOptions<Vehicle>[] = [await vehicleScope(user), { archivedAt: null }];
	if (query.q) parts.push({ registration: { [Op.like]: `%${query.q.toUpperCase()}%` } });
	if (query.depot) parts.push({ depotId: query.depot });
	return { [Op.and]: parts };
}

function statusWhere(status: BoardQueryInput['status']) {
	if (!status) return undefined;
	return status === 'not_forecast' ? { '$current.status$': null } : { '$current.status$': status };
}

function orderFor(query: BoardQueryInput): Order {
	const dir = query.dir === 'desc' ? 'DESC' : 'ASC';
	const urgency = fn('COALESCE', col('current.urgency'), NOT_FORECAST_URGENCY);
	switch (query.sort) {
		case 'crossing':
			return crossingOrder(query);
		case 'registration':
			return [['registration', dir]];
		case 'latest':
			return [
				[fn('COALESCE', col('current.latest_mbar'), -1), dir],
				['registration', 'ASC']
			];
		default:
			return [
				[urgency, dir],
				['registration', 'ASC']
			];
	}
}

/**
 * One page of the vans this person may see, most urgent first by default, with filters and
 * search done in the query (never by loading every van).
 */
export async function listBoard(user: SessionUser, query: BoardQueryInput, now = new Date()) {
	const where = await scopedWhere(user, query);
	const byStatus = statusWhere(query.status);
	const { rows, count } = await Vehicle.findAndCountAll({
		where: byStatus ? { [Op.and]: [where, byStatus] } : where,
		include: [
			{ model: VehicleStatus, as: 'current', required: false },
			{ model: Depot, as: 'depot', attributes: ['name'], required: false },
			{ model: Organisation, as: 'fleet', attributes: ['name'], required: false }
		],
		order: orderFor(query),
		limit: query.pageSize,
		offset: (query.page - 1) * query.pageSize,
		distinct: true
	});
	const visits = await openVisits(
		user,
		rows.map((v) => v.id)
	);
	const items: BoardRow[] = rows.map((v) => {
		const p = v.get({ plain: true }) as Vehicle & {
			current?: VehicleStatus | null;
			depot?: { name: string } | null;
			fleet?: { name: string } | null;
		};
		return {
			id: p.id,
			registration: p.registration,
			makeModel: p.makeModel ?? null,
			fleet: p.fleet?.name ?? null,
			depot: p.depot?.name ?? null,
			status: (p.current?.status as VanStatus | undefined) ?? null,
			confidence: p.current?.confidence ?? null,
			latestMbar: p.current?.latestMbar ?? null,
			concernLineMbar: p.current?.concernLineMbar ?? null,
			growthMbarPerWeek: p.current?.growthMbarPerWeek ?? null,
			crossingEarliest: iso(p.current?.crossingEarliest),
			crossingExpected: iso(p.current?.crossingExpected),
			crossingLatest: iso(p.current?.crossingLatest),
			openVisit: visits.get(p.id) ?? null,
			...suggestion(now, p.current?.crossingEarliest ?? null, p.current?.status === 'over_line')
		};
	});
	return { items, total: count, page: query.page, pageSize: query.pageSize };
}

/**
 * The standing visit of each van on the page (a van has at most one). A workshop sees only
 * visits booked with it, so the board tells nothing of another workshop's work.
 */
async function openVisits(user: SessionUser, vehicleIds: number[]) {
	const found = new Map<number, { id: number; state: OpenBookingState }>();
	if (!vehicleIds.length) return found;
	const rows = await Booking.findAll({
		where: {
			vehicleId: { [Op.in]: vehicleIds },
			state: { [Op.in]: [...OPEN_BOOKING_STATES] },
			...(user.role === 'workshop' ? { workshopId: user.organisationId } : {})
		},
		attributes: ['id', 'vehicleId', 'state'],
		order: [['id', 'DESC']]
	});
	for (const b of rows)
		if (!found.has(b.vehicleId))
			found.set(b.vehicleId, { id: b.id, state: b.state as OpenBookingState });
	return found;
}

/** Vans without an expected crossing sort after those with one, whichever the direction. */
function crossingOrder(query: BoardQueryInput): Order {
	return [
		[fn('COALESCE', col('current.no_crossing'), 1), 'ASC'],
		[col('current.crossing_expected'), query.dir === 'desc' ? 'DESC' : 'ASC'],
		['registration', 'ASC']
	];
}

/** Counts per status (filters other than status applied), and the depots to filter by. */
export async function boardSummary(
	user: SessionUser,
	query: Pick<BoardQueryInput, 'q' | 'depot'>,
	now: Date,
	weeks = 12
) {
	const where = await scopedWhere(user, query);
	const grouped = (await Vehicle.findAll({
		attributes: [
			[col('current.status'), 'status'],
			[fn('COUNT', 1), 'count']
		],
		where,
		include: [{ model: VehicleStatus, as: 'current', attributes: [], required: false }],
		group: [col('current.status')],
		raw: true
	})) as unknown as { status: string | null; count: number | string }[];
	const counts: Record<string, number> = Object.fromEntries(
		[...VAN_STATUSES, 'not_forecast'].map((s) => [s, 0])
	);
	for (const g of grouped) counts[g.status ?? 'not_forecast'] += Number(g.count);

	const until = new Date(now.getTime() + weeks * 7 * 86_400_000);
	const upcoming = (await Vehicle.findAll({
		attributes: [[col('current.crossing_expected'), 'expected']],
		where: { [Op.and]: [where, { '$current.crossing_expected$': { [Op.between]: [now, until] } }] },
		include: [{ model: VehicleStatus, as: 'current', attributes: [], required: true }],
		raw: true
	})) as unknown as { expected: string | Date }[];
	const perWeek = Array.from({ length: weeks }, (_, i) => ({
		weekStart: new Date(now.getTime() + i * 7 * 86_400_000).toISOString(),
		count: 0
	}));
	for (const u of upcoming) {
		const i = Math.floor((new Date(u.expected).getTime() - now.getTime()) / (7 * 86_400_000));
		if (i >= 0 && i < weeks) perWeek[i].count++;
	}
	return { counts, perWeek };
}

/** Depots of the fleets this person sees, for the depot filter. */
export async function visibleDepots(user: SessionUser) {
	const scope = await vehicleScope(user);
	const fleetIds = (
		await Vehicle.findAll({
			attributes: ['organisationId'],
			where: scope,
			group: ['organisationId'],
			raw: true
		})
	).map((v) => v.organisationId);
	if (!fleetIds.length) return [];
	const depots = await Depot.findAll({
		where: { organisationId: { [Op.in]: fleetIds } },
		order: [['name', 'ASC']],
		raw: true
	});
	return depots.map((d) => ({ id: d.id, name: d.name }));
}

/** The board's hint: the suggested window's end, or "as soon as possible"; none without a forecast. */
function suggestion(now: Date, crossingEarliest: Date | string | null, overLine: boolean) {
	if (!crossingEarliest && !overLine) return { suggestedVisitBy: null, visitUrgent: false };
	const w = suggestedVisitWindow(now, {
		crossingEarliest: crossingEarliest ? new Date(crossingEarliest) : null,
		overLine
	});
	return { suggestedVisitBy: w.to.toISOString(), visitUrgent: w.urgent };
}
