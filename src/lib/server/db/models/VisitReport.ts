import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** What the workshop found and did at a visit; its actions become events the forecast reads. */
export class VisitReport extends Model<
	InferAttributes<VisitReport>,
	InferCreationAttributes<VisitReport>
> {
	declare id: CreationOptional<number>;
	declare vehicleId: number;
	declare workshopId: number;
	declare bookingId: CreationOptional<number | null>;
	declare authorId: number;
	declare visitedAt: Date;
	declare findings: CreationOptional<string | null>;
	declare rootCause: CreationOptional<Record<string, unknown> | null>;
	declare actions: CreationOptional<Record<string, unknown> | null>;
	declare signedOffAt: CreationOptional<Date | null>;
	declare signedOffById: CreationOptional<number | null>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		VisitReport.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				vehicleId: { type: DataTypes.INTEGER, allowNull: false },
				workshopId: { type: DataTypes.INTEGER, allowNull: false },
				bookingId: { type: DataTypes.INTEGER, allowNull: true },
				authorId: { type: DataTypes.INTEGER, allowNull: false },
				visitedAt: { type: DataTypes.DATE, allowNull: false },
				findings: { type: DataTypes.TEXT, allowNull: true },
				rootCause: { type: DataTypes.JSON, allowNull: true },
				actions: { type: DataTypes.JSON, allowNull: true },
				signedOffAt: { type: DataTypes.DATE, allowNull: true },
				signedOffById: { type: DataTypes.INTEGER, allowNull: true },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'visit_reports' }
		);
	}
}
