import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';
import {
	READING_SOURCES,
	TEST_CONDITIONS,
	type ReadingSource,
	type TestCondition
} from '../../../domain/vocabulary';

/** One Δp reading. Stored in mbar whatever unit it arrived in. */
export class Reading extends Model<InferAttributes<Reading>, InferCreationAttributes<Reading>> {
	declare id: CreationOptional<number>;
	declare vehicleId: number;
	declare takenAt: Date;
	declare odometerKm: CreationOptional<number | null>;
	declare deltaPMbar: number;
	declare rawVolts: CreationOptional<number | null>;
	declare condition: TestCondition;
	declare rpm: CreationOptional<number | null>;
	declare airMassFlowKgH: CreationOptional<number | null>;
	declare exhaustTempC: CreationOptional<number | null>;
	declare ambientPressureKpa: CreationOptional<number | null>;
	declare source: ReadingSource;
	declare importBatchId: CreationOptional<number | null>;
	declare authorId: CreationOptional<number | null>;
	/** The sender's own id for the reading, so a retried API call stores nothing twice. */
	declare clientReadingId: CreationOptional<string | null>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		Reading.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				vehicleId: { type: DataTypes.INTEGER, allowNull: false },
				takenAt: { type: DataTypes.DATE, allowNull: false },
				odometerKm: { type: DataTypes.DOUBLE, allowNull: true },
				deltaPMbar: { type: DataTypes.DOUBLE, allowNull: false },
				rawVolts: { type: DataTypes.DOUBLE, allowNull: true },
				condition: {
					type: DataTypes.STRING(16),
					allowNull: false,
					validate: { isIn: [TEST_CONDITIONS] }
				},
				rpm: { type: DataTypes.INTEGER, allowNull: true },
				airMassFlowKgH: { type: DataTypes.DOUBLE, allowNull: true },
				exhaustTempC: { type: DataTypes.DOUBLE, allowNull: true },
				ambientPressureKpa: { type: DataTypes.DOUBLE, allowNull: true },
				source: {
					type: DataTypes.STRING(16),
					allowNull: false,
					validate: { isIn: [READING_SOURCES] }
				},
				importBatchId: { type: DataTypes.INTEGER, allowNull: true },
				authorId: { type: DataTypes.INTEGER, allowNull: true },
				clientReadingId: { type: DataTypes.STRING(80), allowNull: true },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'readings' }
		);
	}
}
