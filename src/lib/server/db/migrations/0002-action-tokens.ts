import { DataTypes, type QueryInterface } from 'sequelize';

/** Single-use, expiring links: invitations and password resets. Only a hash is stored. */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
	await qi.createTable('action_tokens', {
		id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true, allowNull: false },
		user_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
		purpose: { type: DataTypes.STRING(16), allowNull: false },
		token_hash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
		expires_at: { type: DataTypes.DATE, allowNull: false },
		used_at: { type: DataTypes.DATE, allowNull: true },
		created_at: { type: DataTypes.DATE, allowNull: false },
		updated_at: { type: DataTypes.DATE, allowNull: false }
	});
	await qi.addIndex('action_tokens', ['user_id', 'purpose']);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
	await qi.dropTable('action_tokens');
}
