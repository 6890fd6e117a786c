import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** A day a workshop is closed (holiday, stock-take), as its local date 'YYYY-MM-DD'. */
export class WorkshopClosedDay extends Model<
	InferAttributes<WorkshopClosedDay>,
	InferCreationAttributes<WorkshopClosedDay>
> {
	declare id: CreationOptional<number>;
	declare workshopId: number;
	declare day: string;
	declare note: CreationOptional<string | null>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		WorkshopClosedDay.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				workshopId: { type: DataTypes.INTEGER, allowNull: false },
				day: { type: DataTypes.STRING(10), allowNull: false },
				note: { type: DataTypes.STRING(200), allowNull: true },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'workshop_closed_days' }
		);
	}
}
