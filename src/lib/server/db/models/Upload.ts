import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

export class Upload extends Model<InferAttributes<Upload>, InferCreationAttributes<Upload>> {
	declare id: CreationOptional<number>;
	declare organisationId: number;
	declare ownerId: number;
	declare vehicleId: CreationOptional<number | null>;
	declare name: string;
	declare contentType: string;
	declare sizeBytes: number;
	declare sha256: string;
	declare storagePath: string;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		Upload.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				organisationId: { type: DataTypes.INTEGER, allowNull: false },
				ownerId: { type: DataTypes.INTEGER, allowNull: false },
				vehicleId: { type: DataTypes.INTEGER, allowNull: true },
				name: { type: DataTypes.STRING(255), allowNull: false },
				contentType: { type: DataTypes.STRING(120), allowNull: false },
				sizeBytes: { type: DataTypes.BIGINT, allowNull: false },
				sha256: { type: DataTypes.STRING(64), allowNull: false },
				storagePath: { type: DataTypes.STRING(500), allowNull: false },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'uploads' }
		);
	}
}
