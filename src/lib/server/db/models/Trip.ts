import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

export class Trip extends Model<InferAttributes<Trip>, InferCreationAttributes<Trip>> {
	declare id: CreationOptional<number>;
	declare vehicleId: number;
	declare driverId: CreationOptional<number | null>;
	declare startedAt: Date;
	declare endedAt: Date;
	declare distanceKm: number;
	declare idleMinutes: CreationOptional<number>;
	declare meanSpeedKmh: CreationOptional<number | null>;
	declare importBatchId: CreationOptional<number | null>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		Trip.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				vehicleId: { type: DataTypes.INTEGER, allowNull: false },
				driverId: { type: DataTypes.INTEGER, allowNull: true },
				startedAt: { type: DataTypes.DATE, allowNull: false },
				endedAt: { type: DataTypes.DATE, allowNull: false },
				distanceKm: { type: DataTypes.DOUBLE, allowNull: false },
				idleMinutes: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
				meanSpeedKmh: { type: DataTypes.DOUBLE, allowNull: true },
				importBatchId: { type: DataTypes.INTEGER, allowNull: true },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'trips' }
		);
	}
}
