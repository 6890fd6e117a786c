import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

export class Depot extends Model<InferAttributes<Depot>, InferCreationAttributes<Depot>> {
	declare id: CreationOptional<number>;
	declare organisationId: number;
	declare name: string;
	declare town: CreationOptional<string | null>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		Depot.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				organisationId: { type: DataTypes.INTEGER, allowNull: false },
				name: { type: DataTypes.STRING(120), allowNull: false },
				town: { type: DataTypes.STRING(120), allowNull: true },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'depots' }
		);
	}
}
