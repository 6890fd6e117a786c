import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** A message waiting to be sent, or sent; the dedupe key makes a rerun queue nothing twice. */
export class OutboxMessage extends Model<
	InferAttributes<OutboxMessage>,
	InferCreationAttributes<OutboxMessage>
> {
	declare id: CreationOptional<number>;
	declare recipient: string;
	declare subject: string;
	declare textBody: string;
	declare htmlBody: CreationOptional<string | null>;
	declare attachments: CreationOptional<Record<string, unknown> | null>;
	declare dedupeKey: string;
	declare state: CreationOptional<'pending' | 'sent' | 'failed'>;
	declare attempts: CreationOptional<number>;
	declare lastError: CreationOptional<string | null>;
	declare nextAttemptAt: CreationOptional<Date | null>;
	declare sentAt: CreationOptional<Date | null>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		OutboxMessage.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				recipient: { type: DataTypes.STRING(254), allowNull: false },
				subject: { type: DataTypes.STRING(255), allowNull: false },
				textBody: { type: DataTypes.TEXT, allowNull: false },
				htmlBody: { type: DataTypes.TEXT, allowNull: true },
				attachments: { type: DataTypes.JSON, allowNull: true },
				dedupeKey: { type: DataTypes.STRING(200), allowNull: false, unique: true },
				state: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'pending' },
				attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
				lastError: { type: DataTypes.TEXT, allowNull: true },
				nextAttemptAt: { type: DataTypes.DATE, allowNull: true },
				sentAt: { type: DataTypes.DATE, allowNull: true },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'outbox_messages' }
		);
	}
}
