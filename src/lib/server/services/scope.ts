import { Op, type WhereOptions } from 'sequelize';
import { Contract, type Vehicle } from '../db';
import type { SessionUser } from '../auth/lucia';

export const isoDay = (d: Date) => d.toISOString().slice(0, 10);

/** Fleets holding a contract with this workshop that is active on `now`. */
export async function contractedFleetIds(workshopId: number, now = new Date()): Promise<number[]> {
	const today = isoDay(now);
	const contracts = await Contract.findAll({
		attributes: ['fleetId'],
		where: {
			workshopId,
			startsOn: { [Op.lte]: today },
			[Op.or]: [{ endsOn: null }, { endsOn: { [Op.gte]: today } }]
		}
	});
	return [...new Set(contracts.map((c) => c.fleetId))];
}

/**
 * The vans this person may see, as a where clause to put in the query itself: a fleet manager
 * their own fleet, a workshop the fleets it has an active contract with, a driver the vans
 * assigned to them. Admins look after accounts, not vans.
 */
export async function vehicleScope(
	user: SessionUser,
	now = new Date()
): Promise<WhereOptions<Vehicle>> {
	switch (user.role) {
		case 'fleet_manager':
			return { organisationId: user.organisationId };
		case 'workshop':
			return { organisationId: { [Op.in]: await contractedFleetIds(user.organisationId, now) } };
		case 'driver':
			return { driverId: user.id };
		case 'admin':
			return { id: { [Op.in]: [] } };
	}
	throw new Error(`Unknown role ${String(user.role)}`);
}
