import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** One failed sign-in, kept in the database so throttling holds across app instances. */
export class SignInAttempt extends Model<
	InferAttributes<SignInAttempt>,
	InferCreationAttributes<SignInAttempt>
> {
	declare id: CreationOptional<number>;
	declare accountKey: string;
	declare addressKey: string;
	declare attemptedAt: Date;

	static initModel(sequelize: Sequelize): void {
		SignInAttempt.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				accountKey: { type: DataTypes.STRING(254), allowNull: false },
				addressKey: { type: DataTypes.STRING(64), allowNull: false },
				attemptedAt: { type: DataTypes.DATE, allowNull: false }
			},
			{ sequelize, tableName: 'sign_in_attempts', timestamps: false }
		);
	}
}
