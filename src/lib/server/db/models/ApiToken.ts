import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** A fleet's bearer token for the telemetry API. Only its SHA-256 is stored. */
export class ApiToken extends Model<InferAttributes<ApiToken>, InferCreationAttributes<ApiToken>> {
	declare id: CreationOptional<number>;
	declare organisationId: number;
	declare name: string;
	declare tokenHash: string;
	/** The first characters, shown in lists so people can tell tokens apart. */
	declare prefix: string;
	declare createdById: number;
	declare lastUsedAt: CreationOptional<Date | null>;
	declare revokedAt: CreationOptional<Date | null>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		ApiToken.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				organisationId: { type: DataTypes.INTEGER, allowNull: false },
				name: { type: DataTypes.STRING(80), allowNull: false },
				tokenHash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
				prefix: { type: DataTypes.STRING(16), allowNull: false },
				createdById: { type: DataTypes.INTEGER, allowNull: false },
				lastUsedAt: { type: DataTypes.DATE, allowNull: true },
				revokedAt: { type: DataTypes.DATE, allowNull: true },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'api_tokens' }
		);
	}
}
