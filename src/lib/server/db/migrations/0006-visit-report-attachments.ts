import { DataTypes, type QueryInterface } from 'sequelize';

// Frozen once merged: later schema changes go in new numbered migrations.

/**
 * Photos and PDFs on a visit report. The bytes live in storage under `storage_key`; the row
 * records what the content sniffing found (`media_type`), so downloads never trust the name.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
	await qi.createTable('visit_report_attachments', {
		id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true, allowNull: false },
		visit_report_id: {
			type: DataTypes.INTEGER,
			allowNull: false,
			references: { model: 'visit_reports', key: 'id' },
			onDelete: 'CASCADE'
		},
		storage_key: { type: DataTypes.STRING(500), allowNull: false, unique: true },
		file_name: { type: DataTypes.STRING(255), allowNull: false },
		media_type: { type: DataTypes.STRING(64), allowNull: false },
		size_bytes: { type: DataTypes.BIGINT, allowNull: false },
		sha256: { type: DataTypes.STRING(64), allowNull: false },
		uploaded_by_id: {
			type: DataTypes.INTEGER,
			allowNull: true,
			references: { model: 'users', key: 'id' },
			onDelete: 'SET NULL'
		},
		created_at: { type: DataTypes.DATE, allowNull: false }
	});
	await qi.addIndex('visit_report_attachments', ['visit_report_id', 'id']);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
	await qi.dropTable('visit_report_attachments');
}
