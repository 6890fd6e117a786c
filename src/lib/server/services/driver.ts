import { Op } from 'sequelize';
import { Forecast, Reading, Trip, Vehicle } from '../db';
import type { SessionUser } from '../auth/lucia';

/** The vans assigned to this driver with their latest forecast and the last fortnight of trips. */
export async function listDriverVans(user: SessionUser, now = new Date()) {
	const vans = await Vehicle.findAll({
		where: { driverId: user.id, archivedAt: null },
		order: [['registration', 'ASC']]
	});
	const since = new Date(now.getTime() - 14 * 86_400_000);
	return Promise.all(
		vans.map(async (v) => {
			const [forecast, reading, trips] = await Promise.all([
				Forecast.findOne({ where: { vehicleId: v.id }, order: [['id', 'DESC']] }),
				Reading.findOne({ where: { vehicleId: v.id }, order: [['takenAt', 'DESC']] }),
				Trip.findAll({
					where: { vehicleId: v.id, startedAt: { [Op.gte]: since } },
					order: [['startedAt', 'DESC']]
				})
			]);
			return {
				id: v.id,
				registration: v.registration,
				makeModel: v.makeModel ?? null,
				status: forecast?.status ?? null,
				explanation: forecast?.explanation ?? null,
				latestDeltaPMbar: reading?.deltaPMbar ?? null,
				latestReadingAt: reading ? new Date(reading.takenAt).toISOString() : null,
				tripCount: trips.length,
				tripKm: trips.reduce((sum, t) => sum + t.distanceKm, 0)
			};
		})
	);
}
