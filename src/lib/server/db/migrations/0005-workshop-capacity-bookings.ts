import { DataTypes, type QueryInterface } from 'sequelize';

// Frozen once merged: later schema changes go in new numbered migrations.

const id = { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true, allowNull: false };
const stamps = {
	created_at: { type: DataTypes.DATE, allowNull: false },
	updated_at: { type: DataTypes.DATE, allowNull: false }
};
const ref = (table: string, allowNull: boolean, onDelete: 'CASCADE' | 'SET NULL' | 'RESTRICT') => ({
	type: DataTypes.INTEGER,
	allowNull,
	references: { model: table, key: 'id' },
	onDelete
});

/**
 * Workshop capacity (bays per day, opening hours, closed weekdays and days, visit kinds with
 * durations), the booking slots that hold a bay, and the history of every booking change.
 * A slot is one row per (workshop, day, bay) under a unique constraint, so two bookings can
 * never hold the same bay on the same day, on SQLite and PostgreSQL alike.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
	await qi.createTable('workshop_capacities', {
		workshop_id: { type: DataTypes.INTEGER, primaryKey: true, allowNull: false, references: { model: 'organisations', key: 'id' }, onDelete: 'CASCADE' },
		bays_per_day: { type: DataTypes.INTEGER, allowNull: false },
		/** Wall-clock times in `time_zone`, 'HH:MM'. */
		opens_at: { type: DataTypes.STRING(5), allowNull: false },
		closes_at: { type: DataTypes.STRING(5), allowNull: false },
		/** ISO weekdays (1 = Monday … 7 = Sunday) the workshop is closed. */
		closed_weekdays: { type: DataTypes.JSON, allowNull: false },
		time_zone: { type: DataTypes.STRING(64), allowNull: false },
		...stamps
	});
	await qi.createTable('workshop_closed_days', {
		id,
		workshop_id: ref('organisations', false, 'CASCADE'),
		day: { type: DataTypes.STRING(10), allowNull: false },
		note: { type: DataTypes.STRING(200), allowNull: true },
		...stamps
	});
	await qi.addIndex('workshop_closed_days', ['workshop_id', 'day'], { unique: true });
	await qi.createTable('workshop_visit_kinds', {
		id,
		workshop_id: ref('organisations', false, 'CASCADE'),
		kind: { type: DataTypes.STRING(32), allowNull: false },
		duration_minutes: { type: DataTypes.INTEGER, allowNull: false },
		...stamps
	});
	await qi.addIndex('workshop_visit_kinds', ['workshop_id', 'kind'], { unique: true });
	await qi.createTable('booking_slots', {
		id,
		booking_id: ref('bookings', false, 'CASCADE'),
		workshop_id: ref('organisations', false, 'CASCADE'),
		/** The visit's local day in the workshop's zone, 'YYYY-MM-DD'. */
		day: { type: DataTypes.STRING(10), allowNull: false },
		bay: { type: DataTypes.INTEGER, allowNull: false },
		...stamps
	});
	await qi.addIndex('booking_slots', ['workshop_id', 'day', 'bay'], { unique: true, name: 'booking_slots_one_per_bay' });
	await qi.addIndex('booking_slots', ['booking_id'], { unique: true });
	await qi.createTable('booking_changes', {
		id,
		booking_id: ref('bookings', false, 'CASCADE'),
		user_id: ref('users', true, 'SET NULL'),
		at: { type: DataTypes.DATE, allowNull: false },
		action: { type: DataTypes.STRING(16), allowNull: false },
		from_state: { type: DataTypes.STRING(16), allowNull: true },
		to_state: { type: DataTypes.STRING(16), allowNull: false },
		starts_at: { type: DataTypes.DATE, allowNull: true },
		ends_at: { type: DataTypes.DATE, allowNull: true },
		sequence: { type: DataTypes.INTEGER, allowNull: false },
		reason: { type: DataTypes.TEXT, allowNull: true },
		...stamps
	});
	await qi.addIndex('booking_changes', ['booking_id', 'at']);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
	await qi.dropTable('booking_changes');
	await qi.dropTable('booking_slots');
	await qi.dropTable('workshop_visit_kinds');
	await qi.dropTable('workshop_closed_days');
	await qi.dropTable('workshop_capacities');
}
