import type { Sequelize } from 'sequelize';
import { createSequelize } from './sequelize';
import { createMigrator } from './migrator';
import { withMigrationLock } from './migration-lock';
import { config } from '../config';
import * as models from './models';

const {
	ApiToken,
	Booking,
	Contract,
	Depot,
	Forecast,
	ImportBatch,
	Organisation,
	Reading,
	SensorTest,
	SensorType,
	Session,
	Trip,
	Upload,
	User,
	Vehicle,
	VehicleEvent,
	VisitReport,
	VisitReportAttachment
} = models;

function associate(): void {
	Organisation.hasMany(User, { foreignKey: 'organisationId' });
	User.belongsTo(Organisation, { foreignKey: 'organisationId', as: 'organisation' });
	Session.belongsTo(User, { foreignKey: 'userId', as: 'user' });
	Organisation.hasMany(Depot, { foreignKey: 'organisationId' });
	Depot.belongsTo(Organisation, { foreignKey: 'organisationId' });
	Contract.belongsTo(Organisation, { foreignKey: 'fleetId', as: 'fleet' });
	Contract.belongsTo(Organisation, { foreignKey: 'workshopId', as: 'workshop' });
	Vehicle.belongsTo(Organisation, { foreignKey: 'organisationId', as: 'fleet' });
	Vehicle.belongsTo(Depot, { foreignKey: 'depotId', as: 'depot' });
	Vehicle.belongsTo(SensorType, { foreignKey: 'sensorTypeId', as: 'sensorType' });
	Vehicle.belongsTo(User, { foreignKey: 'driverId', as: 'driver' });
	Vehicle.hasMany(Reading, { foreignKey: 'vehicleId', as: 'readings' });
	Reading.belongsTo(Vehicle, { foreignKey: 'vehicleId', as: 'vehicle' });
	Vehicle.hasMany(VehicleEvent, { foreignKey: 'vehicleId', as: 'events' });
	VehicleEvent.belongsTo(Vehicle, { foreignKey: 'vehicleId', as: 'vehicle' });
	Vehicle.hasMany(Trip, { foreignKey: 'vehicleId', as: 'trips' });
	Trip.belongsTo(Vehicle, { foreignKey: 'vehicleId', as: 'vehicle' });
	Vehicle.hasMany(Forecast, { foreignKey: 'vehicleId', as: 'forecasts' });
	Vehicle.hasOne(models.VehicleStatus, { foreignKey: 'vehicleId', as: 'current' });
	models.VehicleStatus.belongsTo(Vehicle, { foreignKey: 'vehicleId', as: 'vehicle' });
	Forecast.belongsTo(Vehicle, { foreignKey: 'vehicleId', as: 'vehicle' });
	Booking.belongsTo(Vehicle, { foreignKey: 'vehicleId', as: 'vehicle' });
	Booking.belongsTo(Organisation, { foreignKey: 'workshopId', as: 'workshop' });
	Booking.hasOne(models.BookingSlot, { foreignKey: 'bookingId', as: 'slot' });
	Booking.hasMany(models.BookingChange, { foreignKey: 'bookingId', as: 'changes' });
	VisitReport.belongsTo(Vehicle, { foreignKey: 'vehicleId', as: 'vehicle' });
	VisitReport.hasMany(VisitReportAttachment, { foreignKey: 'visitReportId', as: 'attachments' });
	SensorTest.belongsTo(Vehicle, { foreignKey: 'vehicleId', as: 'vehicle' });
	Upload.belongsTo(Organisation, { foreignKey: 'organisationId' });
	ApiToken.belongsTo(Organisation, { foreignKey: 'organisationId' });
	ImportBatch.belongsTo(Organisation, { foreignKey: 'organisationId' });
}

let instance: Sequelize | null = null;

/** The one Sequelize instance of this process, with every model and association wired. */
export function getDb(): Sequelize {
	if (instance) return instance;
	const sequelize = createSequelize();
	for (const model of Object.values(models)) model.initModel(sequelize);
	associate();
	instance = sequelize;
	return sequelize;
}

/** Applies pending migrations; instances starting together on PostgreSQL take turns. */
export async function migrate(): Promise<string[]> {
	const done = await withMigrationLock(config.DATABASE_URL, () => createMigrator(getDb()).up());
	return done.map((m) => m.name);
}

export async function closeDb(): Promise<void> {
	if (instance) await instance.close();
	instance = null;
}

export * from './models';
export { together } from './together';
export { inTransaction } from './sequelize';
export { serializeOn } from './serialize';
