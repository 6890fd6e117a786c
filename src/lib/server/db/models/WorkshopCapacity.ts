import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** A workshop's bays per day and opening hours (wall-clock times in `timeZone`). */
export class WorkshopCapacity extends Model<
	InferAttributes<WorkshopCapacity>,
	InferCreationAttributes<WorkshopCapacity>
> {
	declare workshopId: number;
	declare baysPerDay: number;
	declare opensAt: string;
	declare closesAt: string;
	/** ISO weekdays, 1 = Monday … 7 = Sunday. */
	declare closedWeekdays: number[];
	declare timeZone: string;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		WorkshopCapacity.init(
			{
				workshopId: { type: DataTypes.INTEGER, primaryKey: true, allowNull: false },
				baysPerDay: { type: DataTypes.INTEGER, allowNull: false },
				opensAt: { type: DataTypes.STRING(5), allowNull: false },
				closesAt: { type: DataTypes.STRING(5), allowNull: false },
				closedWeekdays: { type: DataTypes.JSON, allowNull: false },
				timeZone: { type: DataTypes.STRING(64), allowNull: false },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'workshop_capacities' }
		);
	}
}
