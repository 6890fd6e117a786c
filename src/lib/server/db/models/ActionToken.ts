import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

export type ActionPurpose = 'invite' | 'reset';

export class ActionToken extends Model<
	InferAttributes<ActionToken>,
	InferCreationAttributes<ActionToken>
> {
	declare id: CreationOptional<number>;
	declare userId: number;
	declare purpose: ActionPurpose;
	declare tokenHash: string;
	declare expiresAt: Date;
	declare usedAt: CreationOptional<Date | null>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		ActionToken.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				userId: { type: DataTypes.INTEGER, allowNull: false },
				purpose: { type: DataTypes.STRING(16), allowNull: false },
				tokenHash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
				expiresAt: { type: DataTypes.DATE, allowNull: false },
				usedAt: { type: DataTypes.DATE, allowNull: true },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'action_tokens' }
		);
	}
}
