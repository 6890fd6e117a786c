import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** The answer given to a request that carried an `Idempotency-Key`, replayed on a retry. */
export class IdempotencyKey extends Model<
	InferAttributes<IdempotencyKey>,
	InferCreationAttributes<IdempotencyKey>
> {
	declare id: CreationOptional<number>;
	declare organisationId: number;
	declare key: string;
	/** Method and route the key was used on, e.g. "POST /api/v1/readings". */
	declare endpoint: string;
	/** SHA-256 of the request body, so a key reused for a different body is refused. */
	declare requestHash: string;
	declare statusCode: number;
	declare responseBody: string;
	declare createdAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		IdempotencyKey.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				organisationId: { type: DataTypes.INTEGER, allowNull: false },
				key: { type: DataTypes.STRING(200), allowNull: false },
				endpoint: { type: DataTypes.STRING(120), allowNull: false },
				requestHash: { type: DataTypes.STRING(64), allowNull: false },
				statusCode: { type: DataTypes.INTEGER, allowNull: false },
				responseBody: { type: DataTypes.TEXT, allowNull: false },
				createdAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'idempotency_keys', updatedAt: false }
		);
	}
}
