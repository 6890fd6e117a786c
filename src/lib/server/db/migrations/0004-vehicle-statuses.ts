import { DataTypes, type QueryInterface } from 'sequelize';

/**
 * Each van's current forecast in one narrow row, so the risk board sorts and filters 5,000
 * vans without grouping the whole forecast history. Backfilled from the newest forecasts.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
	await qi.createTable('vehicle_statuses', {
		vehicle_id: { type: DataTypes.INTEGER, primaryKey: true, allowNull: false, references: { model: 'vehicles', key: 'id' }, onDelete: 'CASCADE' },
		status: { type: DataTypes.STRING(24), allowNull: false },
		/** Sort key: status rank × 100,000 + days to the expected crossing (99,999 when none). */
		urgency: { type: DataTypes.INTEGER, allowNull: false },
		/** 0 when a crossing is expected, 1 when not, so those without sort last either way. */
		no_crossing: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
		confidence: { type: DataTypes.STRING(16), allowNull: true },
		latest_mbar: { type: DataTypes.DOUBLE, allowNull: true },
		concern_line_mbar: { type: DataTypes.DOUBLE, allowNull: false },
		growth_mbar_per_week: { type: DataTypes.DOUBLE, allowNull: true },
		crossing_earliest: { type: DataTypes.DATE, allowNull: true },
		crossing_expected: { type: DataTypes.DATE, allowNull: true },
		crossing_latest: { type: DataTypes.DATE, allowNull: true },
		computed_at: { type: DataTypes.DATE, allowNull: false }
	});
	await qi.addIndex('vehicle_statuses', ['urgency']);
	await qi.addIndex('vehicle_statuses', ['status']);
	await qi.sequelize.query(`
		INSERT INTO vehicle_statuses (vehicle_id, status, urgency, no_crossing, confidence, latest_mbar, concern_line_mbar,
			growth_mbar_per_week, crossing_earliest, crossing_expected, crossing_latest, computed_at)
		SELECT f.vehicle_id, f.status,
			(CASE f.status WHEN 'over_line' THEN 0 WHEN 'crossing_soon' THEN 1 WHEN 'check_sensor' THEN 2
				WHEN 'watch' THEN 3 WHEN 'insufficient_data' THEN 4 ELSE 5 END) * 100000 + 99999,
			CASE WHEN f.crossing_expected IS NULL THEN 1 ELSE 0 END,
			f.confidence, f.latest_mbar, f.concern_line_mbar, f.growth_mbar_per_week,
			f.crossing_earliest, f.crossing_expected, f.crossing_latest, f.computed_at
		FROM forecasts f
		WHERE f.id IN (SELECT MAX(id) FROM forecasts GROUP BY vehicle_id)`);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
	await qi.dropTable('vehicle_statuses');
}
