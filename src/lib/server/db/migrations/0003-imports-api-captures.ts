import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * Getting readings in: per-token rate-limit buckets and idempotency records for the telemetry
 * API (in the database so they hold across instances), the batch a van was imported in (so a
 * vans import can be undone), and indexes that undoing a batch and listing uploads use.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
	await qi.createTable('api_rate_buckets', {
		api_token_id: {
			type: DataTypes.INTEGER,
			primaryKey: true,
			allowNull: false,
			references: { model: 'api_tokens', key: 'id' },
			onDelete: 'CASCADE'
		},
		tokens: { type: DataTypes.DOUBLE, allowNull: false },
		refilled_at: { type: DataTypes.DATE, allowNull: false }
	});
	await qi.createTable('idempotency_keys', {
		id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true, allowNull: false },
		organisation_id: {
			type: DataTypes.INTEGER,
			allowNull: false,
			references: { model: 'organisations', key: 'id' },
			onDelete: 'CASCADE'
		},
		key: { type: DataTypes.STRING(200), allowNull: false },
		endpoint: { type: DataTypes.STRING(120), allowNull: false },
		request_hash: { type: DataTypes.STRING(64), allowNull: false },
		status_code: { type: DataTypes.INTEGER, allowNull: false },
		response_body: { type: DataTypes.TEXT, allowNull: false },
		created_at: { type: DataTypes.DATE, allowNull: false }
	});
	await qi.addIndex('idempotency_keys', ['organisation_id', 'key'], { unique: true });
	await qi.addIndex('idempotency_keys', ['created_at']);
	await qi.addColumn('vehicles', 'import_batch_id', {
		type: DataTypes.INTEGER,
		allowNull: true,
		references: { model: 'import_batches', key: 'id' },
		onDelete: 'SET NULL'
	});
	await qi.addIndex('vehicles', ['import_batch_id']);
	await qi.addIndex('trips', ['import_batch_id']);
	await qi.addIndex('vehicle_events', ['import_batch_id']);
	await qi.addIndex('import_batches', ['organisation_id', 'created_at']);
	await qi.addIndex('api_tokens', ['organisation_id']);
	await qi.addIndex('uploads', ['organisation_id']);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
	await qi.removeIndex('uploads', ['organisation_id']);
	await qi.removeIndex('api_tokens', ['organisation_id']);
	await qi.removeIndex('import_batches', ['organisation_id', 'created_at']);
	await qi.removeIndex('vehicle_events', ['import_batch_id']);
	await qi.removeIndex('trips', ['import_batch_id']);
	await qi.removeIndex('vehicles', ['import_batch_id']);
	await qi.removeColumn('vehicles', 'import_batch_id');
	await qi.dropTable('idempotency_keys');
	await qi.dropTable('api_rate_buckets');
}
