import type * as Db from '../../src/lib/server/db';

/** Small builders for service tests: an organisation with people, vans and readings. */
export function factories(
	db: typeof Db,
	passwordHash = '$argon2id$v=19$m=19456,t=2,p=1$c29tZXNhbHQ$ZmFrZWhhc2hmb3J0ZXN0c29ubHk'
) {
	return {
		async organisation(name: string, kind: 'fleet' | 'workshop') {
			return db.Organisation.create({ name, kind });
		},
		async person(
			organisationId: number,
			email: string,
			role: 'fleet_manager' | 'workshop' | 'driver' | 'admin',
			extra: Partial<Db.User> = {}
		) {
			return db.User.create({
				organisationId,
				email,
				name: email.split('@')[0],
				role,
				passwordHash,
				notifyStatuses: ['over_line', 'crossing_soon'],
				...extra
			});
		},
		async contract(
			fleetId: number,
			workshopId: number,
			startsOn: string,
			endsOn: string | null = null
		) {
			return db.Contract.create({ fleetId, workshopId, startsOn, endsOn });
		},
		async van(organisationId: number, registration: string) {
			return db.Vehicle.create({ organisationId, registration });
		},
		/** Road-load readings every `everyDays` ending at `end`, Δp from `level(dayIndex)`. */
		async readings(
			vehicleId: number,
			end: Date,
			count: number,
			everyDays: number,
			level: (i: number) => number
		) {
			const rows = Array.from({ length: count }, (_, i) => ({
				vehicleId,
				takenAt: new Date(end.getTime() - (count - 1 - i) * everyDays * 86_400_000),
				odometerKm: 50_000 + i * everyDays * 80,
				deltaPMbar: level(i),
				condition: 'road_load' as const,
				source: 'manual' as const
			}));
			await db.Reading.bulkCreate(rows);
		}
	};
}
