import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** A fleet contracts a workshop from one date to another (open-ended when endsOn is null). */
export class Contract extends Model<InferAttributes<Contract>, InferCreationAttributes<Contract>> {
	declare id: CreationOptional<number>;
	declare fleetId: number;
	declare workshopId: number;
	declare startsOn: string;
	declare endsOn: CreationOptional<string | null>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		Contract.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				fleetId: { type: DataTypes.INTEGER, allowNull: false },
				workshopId: { type: DataTypes.INTEGER, allowNull: false },
				startsOn: { type: DataTypes.DATEONLY, allowNull: false },
				endsOn: { type: DataTypes.DATEONLY, allowNull: true },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'contracts' }
		);
	}
}
