import {
	DataTypes,
	Model,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** A token bucket per API token: requests spend tokens, time refills them (rate limit). */
export class ApiRateBucket extends Model<
	InferAttributes<ApiRateBucket>,
	InferCreationAttributes<ApiRateBucket>
> {
	declare apiTokenId: number;
	declare tokens: number;
	declare refilledAt: Date;

	static initModel(sequelize: Sequelize): void {
		ApiRateBucket.init(
			{
				apiTokenId: { type: DataTypes.INTEGER, primaryKey: true, allowNull: false },
				tokens: { type: DataTypes.DOUBLE, allowNull: false },
				refilledAt: { type: DataTypes.DATE, allowNull: false }
			},
			{ sequelize, tableName: 'api_rate_buckets', timestamps: false }
		);
	}
}
