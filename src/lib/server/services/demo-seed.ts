import { simulateVanHistory } from '../../domain/simulate';
import {
	Contract,
	Depot,
	Organisation,
	Reading,
	SensorType,
	Trip,
	User,
	Vehicle,
	VehicleEvent,
	WorkshopCapacity,
	WorkshopVisitKind,
	getDb
} from '../db';
import { hashPassword } from '../auth/password';
import {
	DEMO_ACCOUNTS,
	DEMO_DAYS,
	DEMO_PASSWORD,
	DEPOTS,
	DRIVER_NAMES,
	demoVans
} from '../demo/scenario';
import { isoDay } from './scope';
import { DEFAULT_VISIT_MINUTES } from '../../domain/visits';

const CHUNK = 2_000;
const DAY_MS = 86_400_000;

export interface DemoSeedSummary {
	seeded: boolean;
	vans: number;
	readings: number;
	events: number;
	trips: number;
}

async function insertInChunks<T extends object>(
	model: { bulkCreate(rows: T[]): Promise<unknown> },
	rows: T[]
) {
	for (let i = 0; i < rows.length; i += CHUNK) await model.bulkCreate(rows.slice(i, i + CHUNK));
}

/**
 * Loads the invented demo world into an empty database, in one transaction. Histories come
 * from the seeded simulator, ending on the day of `now`, so the demo always looks current
 * while staying the same story from run to run. Does nothing if any organisation exists.
 */
export async function seedDemo(now = new Date(), days = DEMO_DAYS): Promise<DemoSeedSummary> {
	if ((await Organisation.count()) > 0)
		return { seeded: false, vans: 0, readings: 0, events: 0, trips: 0 };
	const passwordHash = await hashPassword(DEMO_PASSWORD);
	const today = Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate());
	const start = new Date(today - days * DAY_MS);

	return getDb().transaction(async () => {
		const platform = await Organisation.create({ name: 'Sootcast operations', kind: 'platform' });
		const larkspur = await Organisation.create({ name: 'Larkspur Lane Deliveries', kind: 'fleet' });
		const thistledown = await Organisation.create({ name: 'Thistledown Utilities', kind: 'fleet' });
		const fenwright = await Organisation.create({
			name: 'Fenwright Diesel Clinic',
			kind: 'workshop'
		});
		const copperbeech = await Organisation.create({
			name: 'Copperbeech Van Care',
			kind: 'workshop'
		});

		const person = (organisationId: number, email: string, name: string, role: User['role']) =>
			User.create({
				organisationId,
				email,
				name,
				role,
				passwordHash,
				notifyStatuses: ['over_line', 'crossing_soon']
			});
		await person(platform.id, DEMO_ACCOUNTS.admin.email, DEMO_ACCOUNTS.admin.name, 'admin');
		await person(
			larkspur.id,
			DEMO_ACCOUNTS.fleetManager.email,
			DEMO_ACCOUNTS.fleetManager.name,
			'fleet_manager'
		);
		await person(
			thistledown.id,
			DEMO_ACCOUNTS.otherFleetManager.email,
			DEMO_ACCOUNTS.otherFleetManager.name,
			'fleet_manager'
		);
		await person(
			fenwright.id,
			DEMO_ACCOUNTS.workshop.email,
			DEMO_ACCOUNTS.workshop.name,
			'workshop'
		);
		await person(
			copperbeech.id,
			DEMO_ACCOUNTS.otherWorkshop.email,
			DEMO_ACCOUNTS.otherWorkshop.name,
			'workshop'
		);
		const drivers: User[] = [];
		for (const name of DRIVER_NAMES) {
			const email =
				name === DEMO_ACCOUNTS.driver.name
					? DEMO_ACCOUNTS.driver.email
					: `${name.toLowerCase().replace(/[^a-z]+/g, '.')}@larkspur.test`;
			drivers.push(await person(larkspur.id, email, name, 'driver'));
		}

		// Fenwright serves Larkspur; Copperbeech serves Thistledown, and served Larkspur until last year.
		const startsOn = isoDay(start);
		await Contract.create({ fleetId: larkspur.id, workshopId: fenwright.id, startsOn });
		await Contract.create({ fleetId: thistledown.id, workshopId: copperbeech.id, startsOn });
		await Contract.create({
			fleetId: larkspur.id,
			workshopId: copperbeech.id,
			startsOn,
			endsOn: isoDay(new Date(today - 300 * DAY_MS))
		});

		// Capacity: Fenwright has three bays and opens early; Copperbeech two bays and also Saturdays.
		await WorkshopCapacity.create({
			workshopId: fenwright.id,
			baysPerDay: 3,
			opensAt: '07:30',
			closesAt: '17:30',
			closedWeekdays: [6, 7],
			timeZone: 'Europe/London'
		});
		await WorkshopCapacity.create({
			workshopId: copperbeech.id,
			baysPerDay: 2,
			opensAt: '08:00',
			closesAt: '16:00',
			closedWeekdays: [7],
			timeZone: 'Europe/London'
		});
		for (const [kind, durationMinutes] of Object.entries(DEFAULT_VISIT_MINUTES)) {
			await WorkshopVisitKind.create({ workshopId: fenwright.id, kind, durationMinutes });
			await WorkshopVisitKind.create({
				workshopId: copperbeech.id,
				kind,
				durationMinutes: kind === 'off_vehicle_cleaning' ? 300 : durationMinutes
			});
		}

		const depots: Depot[] = [];
		for (const d of DEPOTS)
			depots.push(await Depot.create({ organisationId: larkspur.id, name: d.name, town: d.town }));
		const thistledownYard = await Depot.create({
			organisationId: thistledown.id,
			name: 'Thistledown yard',
			town: 'Mereholt'
		});
		const sensor = await SensorType.create({
			name: 'Δp sensor 0–1000 mbar, 0.5–4.5 V',
			zeroVolts: 0.5,
			fullScaleVolts: 4.5,
			fullScaleMbar: 1000
		});
		await SensorType.create({
			name: 'Δp sensor 0–500 mbar, 0.5–4.5 V',
			zeroVolts: 0.5,
			fullScaleVolts: 4.5,
			fullScaleMbar: 500
		});

		const summary: DemoSeedSummary = { seeded: true, vans: 0, readings: 0, events: 0, trips: 0 };
		const scenario = demoVans();
		for (const [index, van] of scenario.entries()) {
			const isLarkspur = van.fleet === 'larkspur';
			const driver = van.driver === null ? null : drivers[van.driver];
			const vehicle = await Vehicle.create({
				organisationId: isLarkspur ? larkspur.id : thistledown.id,
				depotId: isLarkspur ? depots[van.depot].id : thistledownYard.id,
				registration: van.registration,
				makeModel: van.makeModel,
				engineDisplacementCc: van.makeModel.includes('1.5')
					? 1499
					: van.makeModel.includes('2.2')
						? 2179
						: 1997,
				emissionClass: van.emissionClass,
				fuel: van.fuel,
				oilGrade: van.oilGrade,
				sensorTypeId: sensor.id,
				referenceFlowM3h: 540,
				driverId: driver?.id ?? null
			});
			const history = simulateVanHistory({ seed: 1_000 + index, start, days, ...van.simulation });
			const readings = history.readings.map((r) => ({
				vehicleId: vehicle.id,
				takenAt: r.at,
				odometerKm: r.odometerKm,
				deltaPMbar: r.deltaPMbar,
				condition: r.condition,
				rpm: r.rpm ?? null,
				airMassFlowKgH: r.airMassFlowKgH ?? null,
				exhaustTempC: r.exhaustTempC ?? null,
				ambientPressureKpa: r.ambientPressureKpa ?? null,
				source: 'demo' as const
			}));
			const events = history.events.map((e) => ({
				vehicleId: vehicle.id,
				occurredAt: e.at,
				kind: e.kind,
				odometerKm: e.odometerKm,
				source: 'demo'
			}));
			const trips = history.trips.map((t) => ({
				vehicleId: vehicle.id,
				driverId: driver?.id ?? null,
				startedAt: t.start,
				endedAt: t.end,
				distanceKm: t.distanceKm,
				idleMinutes: t.idleMinutes,
				meanSpeedKmh: t.meanSpeedKmh
			}));
			await insertInChunks(Reading, readings);
			await insertInChunks(VehicleEvent, events);
			await insertInChunks(Trip, trips);
			summary.vans++;
			summary.readings += readings.length;
			summary.events += events.length;
			summary.trips += trips.length;
		}
		return summary;
	});
}
