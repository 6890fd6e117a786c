import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** Who did what to which record, and when. Rows are only ever added. */
export class AuditLog extends Model<InferAttributes<AuditLog>, InferCreationAttributes<AuditLog>> {
	declare id: CreationOptional<number>;
	declare organisationId: CreationOptional<number | null>;
	declare userId: CreationOptional<number | null>;
	declare action: string;
	declare entity: string;
	declare entityId: CreationOptional<string | null>;
	declare details: CreationOptional<Record<string, unknown> | null>;
	declare at: Date;

	static initModel(sequelize: Sequelize): void {
		AuditLog.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				organisationId: { type: DataTypes.INTEGER, allowNull: true },
				userId: { type: DataTypes.INTEGER, allowNull: true },
				action: { type: DataTypes.STRING(40), allowNull: false },
				entity: { type: DataTypes.STRING(40), allowNull: false },
				entityId: { type: DataTypes.STRING(64), allowNull: true },
				details: { type: DataTypes.JSON, allowNull: true },
				at: { type: DataTypes.DATE, allowNull: false }
			},
			{ sequelize, tableName: 'audit_logs', timestamps: false }
		);
	}
}
