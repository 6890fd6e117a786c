import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** A van's current forecast, kept in step by the forecast service; the board reads only this. */
export class VehicleStatus extends Model<
	InferAttributes<VehicleStatus>,
	InferCreationAttributes<VehicleStatus>
> {
	declare vehicleId: number;
	declare status: string;
	declare urgency: number;
	declare noCrossing: number;
	declare confidence: CreationOptional<string | null>;
	declare latestMbar: CreationOptional<number | null>;
	declare concernLineMbar: number;
	declare growthMbarPerWeek: CreationOptional<number | null>;
	declare crossingEarliest: CreationOptional<Date | null>;
	declare crossingExpected: CreationOptional<Date | null>;
	declare crossingLatest: CreationOptional<Date | null>;
	declare computedAt: Date;

	static initModel(sequelize: Sequelize): void {
		VehicleStatus.init(
			{
				vehicleId: { type: DataTypes.INTEGER, primaryKey: true },
				status: { type: DataTypes.STRING(24), allowNull: false },
				urgency: { type: DataTypes.INTEGER, allowNull: false },
				noCrossing: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
				confidence: { type: DataTypes.STRING(16), allowNull: true },
				latestMbar: { type: DataTypes.DOUBLE, allowNull: true },
				concernLineMbar: { type: DataTypes.DOUBLE, allowNull: false },
				growthMbarPerWeek: { type: DataTypes.DOUBLE, allowNull: true },
				crossingEarliest: { type: DataTypes.DATE, allowNull: true },
				crossingExpected: { type: DataTypes.DATE, allowNull: true },
				crossingLatest: { type: DataTypes.DATE, allowNull: true },
				computedAt: { type: DataTypes.DATE, allowNull: false }
			},
			{ sequelize, tableName: 'vehicle_statuses', timestamps: false }
		);
	}
}
