import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** A Δp sensor's linear transfer function: zeroVolts at 0 mbar, fullScaleVolts at fullScaleMbar. */
export class SensorType extends Model<
	InferAttributes<SensorType>,
	InferCreationAttributes<SensorType>
> {
	declare id: CreationOptional<number>;
	declare name: string;
	declare zeroVolts: number;
	declare fullScaleVolts: number;
	declare fullScaleMbar: number;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		SensorType.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				name: { type: DataTypes.STRING(120), allowNull: false, unique: true },
				zeroVolts: { type: DataTypes.DOUBLE, allowNull: false },
				fullScaleVolts: { type: DataTypes.DOUBLE, allowNull: false },
				fullScaleMbar: { type: DataTypes.DOUBLE, allowNull: false },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'sensor_types' }
		);
	}
}
