import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** A kind of visit a workshop offers and how long it takes. */
export class WorkshopVisitKind extends Model<
	InferAttributes<WorkshopVisitKind>,
	InferCreationAttributes<WorkshopVisitKind>
> {
	declare id: CreationOptional<number>;
	declare workshopId: number;
	declare kind: string;
	declare durationMinutes: number;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		WorkshopVisitKind.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				workshopId: { type: DataTypes.INTEGER, allowNull: false },
				kind: { type: DataTypes.STRING(32), allowNull: false },
				durationMinutes: { type: DataTypes.INTEGER, allowNull: false },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'workshop_visit_kinds' }
		);
	}
}
