import { Op, type WhereOptions } from 'sequelize';
import {
	Depot,
	Forecast,
	Reading,
	SensorType,
	Trip,
	User,
	Vehicle,
	VehicleEvent,
	getDb
} from '../db';
import type { SessionUser } from '../auth/lucia';
import type { ListQueryInput, VehicleDetailsInput } from '../../validation/vehicle';
import { vehicleScope } from './scope';
import { NotFoundError } from './errors';
import { recordAudit } from './audit';

export interface VehicleListItem {
	id: number;
	registration: string;
	makeModel: string | null;
	depotName: string | null;
	driverName: string | null;
	latestReadingAt: string | null;
	latestDeltaPMbar: number | null;
	status: string | null;
	crossingExpected: string | null;
}

export interface Page<T> {
	items: T[];
	total: number;
	page: number;
	pageSize: number;
}

/** The vans this person may see, one page at a time, with their latest reading and status. */
export async function listVehicles(
	user: SessionUser,
	query: ListQueryInput
): Promise<Page<VehicleListItem>> {
	const scope = await vehicleScope(user);
	const where: WhereOptions<Vehicle> = query.q
		? {
				[Op.and]: [
					scope,
					{ registration: { [Op.like]: `%${query.q.toUpperCase()}%` } },
					{ archivedAt: null }
				]
			}
		: { [Op.and]: [scope, { archivedAt: null }] };
	const { rows, count } = await Vehicle.findAndCountAll({
		where,
		include: [
			{ model: Depot, as: 'depot', attributes: ['name'] },
			{ model: User, as: 'driver', attributes: ['name'] }
		],
		order: [['registration', 'ASC']],
		limit: query.pageSize,
		offset: (query.page - 1) * query.pageSize
	});
	const ids = rows.map((v) => v.id);
	const [latestReadings, latestForecasts] = await Promise.all([
		latestReadingByVehicle(ids),
		latestForecastByVehicle(ids)
	]);
	return {
		items: rows.map((v) => {
			const plain = v.get({ plain: true }) as Vehicle & {
				depot?: { name: string };
				driver?: { name: string };
			};
			const reading = latestReadings.get(v.id);
			const forecast = latestForecasts.get(v.id);
			return {
				id: v.id,
				registration: v.registration,
				makeModel: v.makeModel ?? null,
				depotName: plain.depot?.name ?? null,
				driverName: plain.driver?.name ?? null,
				latestReadingAt: reading ? new Date(reading.takenAt).toISOString() : null,
				latestDeltaPMbar: reading?.deltaPMbar ?? null,
				status: forecast?.status ?? null,
				crossingExpected: forecast?.crossingExpected
					? new Date(forecast.crossingExpected).toISOString()
					: null
			};
		}),
		total: count,
		page: query.page,
		pageSize: query.pageSize
	};
}

async function latestReadingByVehicle(ids: number[]): Promise<Map<number, Reading>> {
	if (!ids.length) return new Map();
	// One grouped query for the newest timestamp per van, then those rows: portable SQL.
	const newest = (await Reading.findAll({
		attributes: ['vehicleId', [getDb().fn('MAX', getDb().col('taken_at')), 'takenAt']],
		where: { vehicleId: { [Op.in]: ids } },
		group: ['vehicleId'],
		raw: true
	})) as unknown as { vehicleId: number; takenAt: string | Date }[];
	if (!newest.length) return new Map();
	const rows = await Reading.findAll({
		where: {
			[Op.or]: newest.map((n) => ({ vehicleId: n.vehicleId, takenAt: new Date(n.takenAt) }))
		}
	});
	return new Map(rows.map((r) => [r.vehicleId, r]));
}

async function latestForecastByVehicle(ids: number[]): Promise<Map<number, Forecast>> {
	if (!ids.length) return new Map();
	const newest = (await Forecast.findAll({
		attributes: ['vehicleId', [getDb().fn('MAX', getDb().col('id')), 'id']],
		where: { vehicleId: { [Op.in]: ids } },
		group: ['vehicleId'],
		raw: true
	})) as unknown as { id: number }[];
	if (!newest.length) return new Map();
	const rows = await Forecast.findAll({ where: { id: { [Op.in]: newest.map((n) => n.id) } } });
	return new Map(rows.map((f) => [f.vehicleId, f]));
}

/** One van this person may see, or NotFoundError (also for another organisation's van). */
export async function findVisibleVehicle(user: SessionUser, vehicleId: number): Promise<Vehicle> {
	const vehicle = await Vehicle.findOne({
		where: { [Op.and]: [await vehicleScope(user), { id: vehicleId }] }
	});
	if (!vehicle) throw new NotFoundError('That van');
	return vehicle;
}

export async function getVehicleStory(user: SessionUser, vehicleId: number) {
	const vehicle = await findVisibleVehicle(user, vehicleId);
	const [depot, driver, sensorType, readings, events, trips, forecast] = await Promise.all([
		vehicle.depotId ? Depot.findByPk(vehicle.depotId) : null,
		vehicle.driverId ? User.findByPk(vehicle.driverId, { attributes: ['id', 'name'] }) : null,
		vehicle.sensorTypeId ? SensorType.findByPk(vehicle.sensorTypeId) : null,
		Reading.findAll({ where: { vehicleId }, order: [['takenAt', 'DESC']], limit: 500 }),
		VehicleEvent.findAll({ where: { vehicleId }, order: [['occurredAt', 'DESC']], limit: 200 }),
		Trip.findAll({ where: { vehicleId }, order: [['startedAt', 'DESC']], limit: 50 }),
		Forecast.findOne({ where: { vehicleId }, order: [['id', 'DESC']] })
	]);
	return {
		vehicle: vehicle.get({ plain: true }),
		depot: depot ? { id: depot.id, name: depot.name } : null,
		driver: driver ? { id: driver.id, name: driver.name } : null,
		sensorType: sensorType?.get({ plain: true }) ?? null,
		readings: readings.map((r) => r.get({ plain: true })),
		events: events.map((e) => e.get({ plain: true })),
		trips: trips.map((t) => t.get({ plain: true })),
		forecast: forecast?.get({ plain: true }) ?? null
	};
}

/** Fleet managers edit their own vans' details. */
export async function updateVehicleDetails(
	user: SessionUser,
	vehicleId: number,
	input: VehicleDetailsInput
) {
	return getDb().transaction(async () => {
		const vehicle = await findVisibleVehicle(user, vehicleId);
		if (user.role !== 'fleet_manager') throw new NotFoundError('That van');
		await vehicle.update({
			registration: input.registration.toUpperCase(),
			vin: input.vin?.toUpperCase() ?? null,
			makeModel: input.makeModel ?? null,
			engineDisplacementCc: input.engineDisplacementCc ?? null,
			emissionClass: input.emissionClass ?? null,
			fuel: input.fuel,
			oilGrade: input.oilGrade ?? null,
			referenceFlowM3h: input.referenceFlowM3h ?? null
		});
		await recordAudit(user, 'vehicle.update', 'vehicle', vehicle.id, input);
		return vehicle.get({ plain: true });
	});
}
