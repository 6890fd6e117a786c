import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** One CSV import or API batch; undoing it removes every row that carries its id. */
export class ImportBatch extends Model<
	InferAttributes<ImportBatch>,
	InferCreationAttributes<ImportBatch>
> {
	declare id: CreationOptional<number>;
	declare organisationId: number;
	declare kind: 'readings' | 'trips' | 'vehicles' | 'events';
	declare fileName: CreationOptional<string | null>;
	declare rowCount: number;
	declare createdById: CreationOptional<number | null>;
	declare undoneAt: CreationOptional<Date | null>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		ImportBatch.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				organisationId: { type: DataTypes.INTEGER, allowNull: false },
				kind: { type: DataTypes.STRING(16), allowNull: false },
				fileName: { type: DataTypes.STRING(255), allowNull: true },
				rowCount: { type: DataTypes.INTEGER, allowNull: false },
				createdById: { type: DataTypes.INTEGER, allowNull: true },
				undoneAt: { type: DataTypes.DATE, allowNull: true },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'import_batches' }
		);
	}
}
