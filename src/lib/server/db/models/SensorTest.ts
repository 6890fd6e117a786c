import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** A static test or vacuum range check done on a van, with the engine's result. */
export class SensorTest extends Model<
	InferAttributes<SensorTest>,
	InferCreationAttributes<SensorTest>
> {
	declare id: CreationOptional<number>;
	declare vehicleId: number;
	declare kind: 'static' | 'vacuum';
	declare uploadId: CreationOptional<number | null>;
	declare authorId: number;
	declare testedAt: Date;
	declare verdict: string;
	declare result: Record<string, unknown>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		SensorTest.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				vehicleId: { type: DataTypes.INTEGER, allowNull: false },
				kind: { type: DataTypes.STRING(12), allowNull: false },
				uploadId: { type: DataTypes.INTEGER, allowNull: true },
				authorId: { type: DataTypes.INTEGER, allowNull: false },
				testedAt: { type: DataTypes.DATE, allowNull: false },
				verdict: { type: DataTypes.STRING(16), allowNull: false },
				result: { type: DataTypes.JSON, allowNull: false },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'sensor_tests' }
		);
	}
}
