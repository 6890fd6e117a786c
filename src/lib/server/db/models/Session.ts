import {
	DataTypes,
	Model,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

export class Session extends Model<InferAttributes<Session>, InferCreationAttributes<Session>> {
	declare id: string;
	declare userId: number;
	declare expiresAt: Date;

	static initModel(sequelize: Sequelize): void {
		Session.init(
			{
				id: { type: DataTypes.STRING(64), primaryKey: true },
				userId: { type: DataTypes.INTEGER, allowNull: false },
				expiresAt: { type: DataTypes.DATE, allowNull: false }
			},
			{ sequelize, tableName: 'sessions', timestamps: false }
		);
	}
}
