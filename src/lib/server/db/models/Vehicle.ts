import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';
import { FUELS, type Fuel } from '../../../domain/vocabulary';

export class Vehicle extends Model<InferAttributes<Vehicle>, InferCreationAttributes<Vehicle>> {
	declare id: CreationOptional<number>;
	declare organisationId: number;
	declare depotId: CreationOptional<number | null>;
	declare registration: string;
	declare vin: CreationOptional<string | null>;
	declare makeModel: CreationOptional<string | null>;
	declare engineDisplacementCc: CreationOptional<number | null>;
	declare emissionClass: CreationOptional<string | null>;
	declare fuel: CreationOptional<Fuel>;
	declare oilGrade: CreationOptional<string | null>;
	declare sensorTypeId: CreationOptional<number | null>;
	/** Exhaust volumetric flow (m³/h) that flow-scaled readings are normalised to. */
	declare referenceFlowM3h: CreationOptional<number | null>;
	declare driverId: CreationOptional<number | null>;
	declare archivedAt: CreationOptional<Date | null>;
	/** The vans-import batch that created this van, so undoing the batch removes it. */
	declare importBatchId: CreationOptional<number | null>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		Vehicle.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				organisationId: { type: DataTypes.INTEGER, allowNull: false },
				depotId: { type: DataTypes.INTEGER, allowNull: true },
				registration: { type: DataTypes.STRING(16), allowNull: false },
				vin: { type: DataTypes.STRING(17), allowNull: true },
				makeModel: { type: DataTypes.STRING(120), allowNull: true },
				engineDisplacementCc: { type: DataTypes.INTEGER, allowNull: true },
				emissionClass: { type: DataTypes.STRING(16), allowNull: true },
				fuel: {
					type: DataTypes.STRING(24),
					allowNull: false,
					defaultValue: 'en590_diesel',
					validate: { isIn: [FUELS] }
				},
				oilGrade: { type: DataTypes.STRING(32), allowNull: true },
				sensorTypeId: { type: DataTypes.INTEGER, allowNull: true },
				referenceFlowM3h: { type: DataTypes.DOUBLE, allowNull: true },
				driverId: { type: DataTypes.INTEGER, allowNull: true },
				archivedAt: { type: DataTypes.DATE, allowNull: true },
				importBatchId: { type: DataTypes.INTEGER, allowNull: true },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'vehicles' }
		);
	}
}
