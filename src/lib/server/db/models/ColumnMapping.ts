import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** The column mapping an organisation last used for a kind of import, offered again next time. */
export class ColumnMapping extends Model<
	InferAttributes<ColumnMapping>,
	InferCreationAttributes<ColumnMapping>
> {
	declare id: CreationOptional<number>;
	declare organisationId: number;
	declare kind: string;
	declare mapping: Record<string, string>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		ColumnMapping.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				organisationId: { type: DataTypes.INTEGER, allowNull: false },
				kind: { type: DataTypes.STRING(16), allowNull: false },
				mapping: { type: DataTypes.JSON, allowNull: false },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'column_mappings' }
		);
	}
}
