import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** One computed forecast; a vehicle keeps its history, the newest row is its current view. */
export class Forecast extends Model<InferAttributes<Forecast>, InferCreationAttributes<Forecast>> {
	declare id: CreationOptional<number>;
	declare vehicleId: number;
	declare computedAt: Date;
	declare jobRunId: CreationOptional<number | null>;
	declare series: string;
	declare status: string;
	declare confidence: CreationOptional<string | null>;
	declare latestMbar: CreationOptional<number | null>;
	declare concernLineMbar: number;
	declare growthMbarPerWeek: CreationOptional<number | null>;
	declare growthMbarPer1000Km: CreationOptional<number | null>;
	declare baselineMbarPer1000Km: CreationOptional<number | null>;
	declare kmPerDay: CreationOptional<number | null>;
	declare crossingEarliest: CreationOptional<Date | null>;
	declare crossingExpected: CreationOptional<Date | null>;
	declare crossingLatest: CreationOptional<Date | null>;
	declare explanation: string;
	declare details: CreationOptional<Record<string, unknown> | null>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		Forecast.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				vehicleId: { type: DataTypes.INTEGER, allowNull: false },
				computedAt: { type: DataTypes.DATE, allowNull: false },
				jobRunId: { type: DataTypes.INTEGER, allowNull: true },
				series: { type: DataTypes.STRING(24), allowNull: false },
				status: { type: DataTypes.STRING(24), allowNull: false },
				confidence: { type: DataTypes.STRING(16), allowNull: true },
				latestMbar: { type: DataTypes.DOUBLE, allowNull: true },
				concernLineMbar: { type: DataTypes.DOUBLE, allowNull: false },
				growthMbarPerWeek: { type: DataTypes.DOUBLE, allowNull: true },
				growthMbarPer1000Km: { type: DataTypes.DOUBLE, allowNull: true },
				baselineMbarPer1000Km: { type: DataTypes.DOUBLE, allowNull: true },
				kmPerDay: { type: DataTypes.DOUBLE, allowNull: true },
				crossingEarliest: { type: DataTypes.DATE, allowNull: true },
				crossingExpected: { type: DataTypes.DATE, allowNull: true },
				crossingLatest: { type: DataTypes.DATE, allowNull: true },
				explanation: { type: DataTypes.TEXT, allowNull: false },
				details: { type: DataTypes.JSON, allowNull: true },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'forecasts' }
		);
	}
}
