import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';
import { EVENT_KINDS, type EventKind } from '../../../domain/vocabulary';

/** Something that happened to the filter: a regeneration, a cleaning, a replacement, a repair. */
export class VehicleEvent extends Model<
	InferAttributes<VehicleEvent>,
	InferCreationAttributes<VehicleEvent>
> {
	declare id: CreationOptional<number>;
	declare vehicleId: number;
	declare occurredAt: Date;
	declare kind: EventKind;
	declare odometerKm: CreationOptional<number | null>;
	declare notes: CreationOptional<string | null>;
	declare source: string;
	declare authorId: CreationOptional<number | null>;
	declare visitReportId: CreationOptional<number | null>;
	declare importBatchId: CreationOptional<number | null>;
	declare clientEventId: CreationOptional<string | null>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		VehicleEvent.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				vehicleId: { type: DataTypes.INTEGER, allowNull: false },
				occurredAt: { type: DataTypes.DATE, allowNull: false },
				kind: { type: DataTypes.STRING(24), allowNull: false, validate: { isIn: [EVENT_KINDS] } },
				odometerKm: { type: DataTypes.DOUBLE, allowNull: true },
				notes: { type: DataTypes.TEXT, allowNull: true },
				source: { type: DataTypes.STRING(16), allowNull: false },
				authorId: { type: DataTypes.INTEGER, allowNull: true },
				visitReportId: { type: DataTypes.INTEGER, allowNull: true },
				importBatchId: { type: DataTypes.INTEGER, allowNull: true },
				clientEventId: { type: DataTypes.STRING(80), allowNull: true },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'vehicle_events' }
		);
	}
}
