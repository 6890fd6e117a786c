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

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
	await qi.createTable('organisations', {
		id,
		name: { type: DataTypes.STRING(160), allowNull: false },
		kind: { type: DataTypes.STRING(16), allowNull: false },
		time_zone: { type: DataTypes.STRING(64), allowNull: false, defaultValue: 'Europe/London' },
		...stamps
	});
	await qi.createTable('users', {
		id,
		organisation_id: ref('organisations', false, 'RESTRICT'),
		email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
		name: { type: DataTypes.STRING(120), allowNull: false },
		password_hash: { type: DataTypes.STRING(255), allowNull: true },
		role: { type: DataTypes.STRING(20), allowNull: false },
		unit_preference: { type: DataTypes.STRING(8), allowNull: false, defaultValue: 'mbar' },
		locale: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'en-GB' },
		time_zone: { type: DataTypes.STRING(64), allowNull: false, defaultValue: 'Europe/London' },
		notify_digest: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
		notify_statuses: { type: DataTypes.JSON, allowNull: false },
		crossing_window_days: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 30 },
		advice_opt_out: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
		active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
		...stamps
	});
	await qi.addIndex('users', ['organisation_id']);
	await qi.createTable('sessions', {
		id: { type: DataTypes.STRING(64), primaryKey: true, allowNull: false },
		user_id: ref('users', false, 'CASCADE'),
		expires_at: { type: DataTypes.DATE, allowNull: false }
	});
	await qi.addIndex('sessions', ['user_id']);
	await qi.createTable('sign_in_attempts', {
		id,
		account_key: { type: DataTypes.STRING(254), allowNull: false },
		address_key: { type: DataTypes.STRING(64), allowNull: false },
		attempted_at: { type: DataTypes.DATE, allowNull: false }
	});
	await qi.addIndex('sign_in_attempts', ['account_key', 'attempted_at']);
	await qi.addIndex('sign_in_attempts', ['address_key', 'attempted_at']);
	await qi.createTable('contracts', {
		id,
		fleet_id: ref('organisations', false, 'CASCADE'),
		workshop_id: ref('organisations', false, 'CASCADE'),
		starts_on: { type: DataTypes.DATEONLY, allowNull: false },
		ends_on: { type: DataTypes.DATEONLY, allowNull: true },
		...stamps
	});
	await qi.addIndex('contracts', ['workshop_id', 'fleet_id']);
	await qi.createTable('depots', {
		id,
		organisation_id: ref('organisations', false, 'CASCADE'),
		name: { type: DataTypes.STRING(120), allowNull: false },
		town: { type: DataTypes.STRING(120), allowNull: true },
		...stamps
	});
	await qi.createTable('sensor_types', {
		id,
		name: { type: DataTypes.STRING(120), allowNull: false, unique: true },
		zero_volts: { type: DataTypes.DOUBLE, allowNull: false },
		full_scale_volts: { type: DataTypes.DOUBLE, allowNull: false },
		full_scale_mbar: { type: DataTypes.DOUBLE, allowNull: false },
		...stamps
	});
	await qi.createTable('vehicles', {
		id,
		organisation_id: ref('organisations', false, 'CASCADE'),
		depot_id: ref('depots', true, 'SET NULL'),
		registration: { type: DataTypes.STRING(16), allowNull: false },
		vin: { type: DataTypes.STRING(17), allowNull: true },
		make_model: { type: DataTypes.STRING(120), allowNull: true },
		engine_displacement_cc: { type: DataTypes.INTEGER, allowNull: true },
		emission_class: { type: DataTypes.STRING(16), allowNull: true },
		fuel: { type: DataTypes.STRING(24), allowNull: false, defaultValue: 'en590_diesel' },
		oil_grade: { type: DataTypes.STRING(32), allowNull: true },
		sensor_type_id: ref('sensor_types', true, 'SET NULL'),
		reference_flow_m3h: { type: DataTypes.DOUBLE, allowNull: true },
		driver_id: ref('users', true, 'SET NULL'),
		archived_at: { type: DataTypes.DATE, allowNull: true },
		...stamps
	});
	await qi.addIndex('vehicles', ['organisation_id', 'registration'], { unique: true });
	await qi.addIndex('vehicles', ['driver_id']);
	await qi.createTable('import_batches', {
		id,
		organisation_id: ref('organisations', false, 'CASCADE'),
		kind: { type: DataTypes.STRING(16), allowNull: false },
		file_name: { type: DataTypes.STRING(255), allowNull: true },
		row_count: { type: DataTypes.INTEGER, allowNull: false },
		created_by_id: ref('users', true, 'SET NULL'),
		undone_at: { type: DataTypes.DATE, allowNull: true },
		...stamps
	});
	await qi.createTable('readings', {
		id,
		vehicle_id: ref('vehicles', false, 'CASCADE'),
		taken_at: { type: DataTypes.DATE, allowNull: false },
		odometer_km: { type: DataTypes.DOUBLE, allowNull: true },
		delta_p_mbar: { type: DataTypes.DOUBLE, allowNull: false },
		raw_volts: { type: DataTypes.DOUBLE, allowNull: true },
		condition: { type: DataTypes.STRING(16), allowNull: false },
		rpm: { type: DataTypes.INTEGER, allowNull: true },
		air_mass_flow_kg_h: { type: DataTypes.DOUBLE, allowNull: true },
		exhaust_temp_c: { type: DataTypes.DOUBLE, allowNull: true },
		ambient_pressure_kpa: { type: DataTypes.DOUBLE, allowNull: true },
		source: { type: DataTypes.STRING(16), allowNull: false },
		import_batch_id: ref('import_batches', true, 'CASCADE'),
		author_id: ref('users', true, 'SET NULL'),
		client_reading_id: { type: DataTypes.STRING(80), allowNull: true },
		...stamps
	});
	await qi.addIndex('readings', ['vehicle_id', 'taken_at']);
	await qi.addIndex('readings', ['vehicle_id', 'client_reading_id'], { unique: true });
	await qi.addIndex('readings', ['import_batch_id']);
	await qi.createTable('visit_reports', {
		id,
		vehicle_id: ref('vehicles', false, 'CASCADE'),
		workshop_id: ref('organisations', false, 'CASCADE'),
		booking_id: { type: DataTypes.INTEGER, allowNull: true },
		author_id: ref('users', false, 'RESTRICT'),
		visited_at: { type: DataTypes.DATE, allowNull: false },
		findings: { type: DataTypes.TEXT, allowNull: true },
		root_cause: { type: DataTypes.JSON, allowNull: true },
		actions: { type: DataTypes.JSON, allowNull: true },
		signed_off_at: { type: DataTypes.DATE, allowNull: true },
		signed_off_by_id: ref('users', true, 'SET NULL'),
		...stamps
	});
	await qi.addIndex('visit_reports', ['vehicle_id', 'visited_at']);
	await qi.createTable('vehicle_events', {
		id,
		vehicle_id: ref('vehicles', false, 'CASCADE'),
		occurred_at: { type: DataTypes.DATE, allowNull: false },
		kind: { type: DataTypes.STRING(24), allowNull: false },
		odometer_km: { type: DataTypes.DOUBLE, allowNull: true },
		notes: { type: DataTypes.TEXT, allowNull: true },
		source: { type: DataTypes.STRING(16), allowNull: false },
		author_id: ref('users', true, 'SET NULL'),
		visit_report_id: ref('visit_reports', true, 'CASCADE'),
		import_batch_id: ref('import_batches', true, 'CASCADE'),
		client_event_id: { type: DataTypes.STRING(80), allowNull: true },
		...stamps
	});
	await qi.addIndex('vehicle_events', ['vehicle_id', 'occurred_at']);
	await qi.addIndex('vehicle_events', ['vehicle_id', 'client_event_id'], { unique: true });
	await qi.createTable('trips', {
		id,
		vehicle_id: ref('vehicles', false, 'CASCADE'),
		driver_id: ref('users', true, 'SET NULL'),
		started_at: { type: DataTypes.DATE, allowNull: false },
		ended_at: { type: DataTypes.DATE, allowNull: false },
		distance_km: { type: DataTypes.DOUBLE, allowNull: false },
		idle_minutes: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
		mean_speed_kmh: { type: DataTypes.DOUBLE, allowNull: true },
		import_batch_id: ref('import_batches', true, 'CASCADE'),
		...stamps
	});
	await qi.addIndex('trips', ['vehicle_id', 'started_at']);
	await qi.addIndex('trips', ['driver_id', 'started_at']);
	await qi.createTable('job_runs', {
		id,
		job: { type: DataTypes.STRING(40), allowNull: false },
		started_at: { type: DataTypes.DATE, allowNull: false },
		finished_at: { type: DataTypes.DATE, allowNull: true },
		state: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'running' },
		summary: { type: DataTypes.JSON, allowNull: true }
	});
	await qi.addIndex('job_runs', ['job', 'started_at']);
	await qi.createTable('job_leases', {
		job: { type: DataTypes.STRING(40), primaryKey: true, allowNull: false },
		holder: { type: DataTypes.STRING(80), allowNull: false },
		expires_at: { type: DataTypes.DATE, allowNull: false },
		...stamps
	});
	await qi.createTable('forecasts', {
		id,
		vehicle_id: ref('vehicles', false, 'CASCADE'),
		computed_at: { type: DataTypes.DATE, allowNull: false },
		job_run_id: ref('job_runs', true, 'SET NULL'),
		series: { type: DataTypes.STRING(24), allowNull: false },
		status: { type: DataTypes.STRING(24), allowNull: false },
		confidence: { type: DataTypes.STRING(16), allowNull: true },
		latest_mbar: { type: DataTypes.DOUBLE, allowNull: true },
		concern_line_mbar: { type: DataTypes.DOUBLE, allowNull: false },
		growth_mbar_per_week: { type: DataTypes.DOUBLE, allowNull: true },
		growth_mbar_per1000_km: { type: DataTypes.DOUBLE, allowNull: true },
		baseline_mbar_per1000_km: { type: DataTypes.DOUBLE, allowNull: true },
		km_per_day: { type: DataTypes.DOUBLE, allowNull: true },
		crossing_earliest: { type: DataTypes.DATE, allowNull: true },
		crossing_expected: { type: DataTypes.DATE, allowNull: true },
		crossing_latest: { type: DataTypes.DATE, allowNull: true },
		explanation: { type: DataTypes.TEXT, allowNull: false },
		details: { type: DataTypes.JSON, allowNull: true },
		...stamps
	});
	await qi.addIndex('forecasts', ['vehicle_id', 'computed_at']);
	await qi.addIndex('forecasts', ['status']);
	await qi.createTable('outbox_messages', {
		id,
		recipient: { type: DataTypes.STRING(254), allowNull: false },
		subject: { type: DataTypes.STRING(255), allowNull: false },
		text_body: { type: DataTypes.TEXT, allowNull: false },
		html_body: { type: DataTypes.TEXT, allowNull: true },
		attachments: { type: DataTypes.JSON, allowNull: true },
		dedupe_key: { type: DataTypes.STRING(200), allowNull: false, unique: true },
		state: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'pending' },
		attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
		last_error: { type: DataTypes.TEXT, allowNull: true },
		next_attempt_at: { type: DataTypes.DATE, allowNull: true },
		sent_at: { type: DataTypes.DATE, allowNull: true },
		...stamps
	});
	await qi.addIndex('outbox_messages', ['state', 'next_attempt_at']);
	await qi.createTable('bookings', {
		id,
		uid: { type: DataTypes.STRING(120), allowNull: false, unique: true },
		vehicle_id: ref('vehicles', false, 'CASCADE'),
		workshop_id: ref('organisations', false, 'CASCADE'),
		requested_by_id: ref('users', false, 'RESTRICT'),
		visit_kind: { type: DataTypes.STRING(32), allowNull: false },
		state: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'requested' },
		starts_at: { type: DataTypes.DATE, allowNull: true },
		ends_at: { type: DataTypes.DATE, allowNull: true },
		window_from: { type: DataTypes.DATE, allowNull: true },
		window_to: { type: DataTypes.DATE, allowNull: true },
		sequence: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
		reason: { type: DataTypes.TEXT, allowNull: true },
		...stamps
	});
	await qi.addIndex('bookings', ['workshop_id', 'starts_at']);
	await qi.addIndex('bookings', ['vehicle_id']);
	await qi.createTable('uploads', {
		id,
		organisation_id: ref('organisations', false, 'CASCADE'),
		owner_id: ref('users', false, 'RESTRICT'),
		vehicle_id: ref('vehicles', true, 'SET NULL'),
		name: { type: DataTypes.STRING(255), allowNull: false },
		content_type: { type: DataTypes.STRING(120), allowNull: false },
		size_bytes: { type: DataTypes.BIGINT, allowNull: false },
		sha256: { type: DataTypes.STRING(64), allowNull: false },
		storage_path: { type: DataTypes.STRING(500), allowNull: false },
		...stamps
	});
	await qi.createTable('sensor_tests', {
		id,
		vehicle_id: ref('vehicles', false, 'CASCADE'),
		kind: { type: DataTypes.STRING(12), allowNull: false },
		upload_id: ref('uploads', true, 'SET NULL'),
		author_id: ref('users', false, 'RESTRICT'),
		tested_at: { type: DataTypes.DATE, allowNull: false },
		verdict: { type: DataTypes.STRING(16), allowNull: false },
		result: { type: DataTypes.JSON, allowNull: false },
		...stamps
	});
	await qi.addIndex('sensor_tests', ['vehicle_id', 'tested_at']);
	await qi.createTable('api_tokens', {
		id,
		organisation_id: ref('organisations', false, 'CASCADE'),
		name: { type: DataTypes.STRING(80), allowNull: false },
		token_hash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
		prefix: { type: DataTypes.STRING(16), allowNull: false },
		created_by_id: ref('users', false, 'RESTRICT'),
		last_used_at: { type: DataTypes.DATE, allowNull: true },
		revoked_at: { type: DataTypes.DATE, allowNull: true },
		...stamps
	});
	await qi.createTable('column_mappings', {
		id,
		organisation_id: ref('organisations', false, 'CASCADE'),
		kind: { type: DataTypes.STRING(16), allowNull: false },
		mapping: { type: DataTypes.JSON, allowNull: false },
		...stamps
	});
	await qi.addIndex('column_mappings', ['organisation_id', 'kind'], { unique: true });
	await qi.createTable('audit_logs', {
		id,
		organisation_id: ref('organisations', true, 'SET NULL'),
		user_id: ref('users', true, 'SET NULL'),
		action: { type: DataTypes.STRING(40), allowNull: false },
		entity: { type: DataTypes.STRING(40), allowNull: false },
		entity_id: { type: DataTypes.STRING(64), allowNull: true },
		details: { type: DataTypes.JSON, allowNull: true },
		at: { type: DataTypes.DATE, allowNull: false }
	});
	await qi.addIndex('audit_logs', ['organisation_id', 'at']);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
	const tables = [
		'audit_logs', 'column_mappings', 'api_tokens', 'sensor_tests', 'uploads', 'bookings',
		'outbox_messages', 'forecasts', 'job_leases', 'job_runs', 'trips', 'vehicle_events',
		'visit_reports', 'readings', 'import_batches', 'vehicles', 'sensor_types', 'depots',
		'contracts', 'sign_in_attempts', 'sessions', 'users', 'organisations'
	];
	for (const table of tables) await qi.dropTable(table);
}
