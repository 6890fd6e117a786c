import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';
import {
	PRESSURE_UNITS,
	ROLES,
	type PressureUnitCode,
	type Role
} from '../../../domain/vocabulary';

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
	declare id: CreationOptional<number>;
	declare organisationId: number;
	declare email: string;
	declare name: string;
	/** Null until an invited person sets their password. */
	declare passwordHash: CreationOptional<string | null>;
	declare role: Role;
	declare unitPreference: CreationOptional<PressureUnitCode>;
	declare locale: CreationOptional<string>;
	declare timeZone: CreationOptional<string>;
	declare notifyDigest: CreationOptional<boolean>;
	declare notifyStatuses: CreationOptional<string[]>;
	declare crossingWindowDays: CreationOptional<number>;
	declare adviceOptOut: CreationOptional<boolean>;
	declare active: CreationOptional<boolean>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		User.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				organisationId: { type: DataTypes.INTEGER, allowNull: false },
				email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
				name: { type: DataTypes.STRING(120), allowNull: false },
				passwordHash: { type: DataTypes.STRING(255), allowNull: true },
				role: { type: DataTypes.STRING(20), allowNull: false, validate: { isIn: [ROLES] } },
				unitPreference: {
					type: DataTypes.STRING(8),
					allowNull: false,
					defaultValue: 'mbar',
					validate: { isIn: [PRESSURE_UNITS] }
				},
				locale: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'en-GB' },
				timeZone: { type: DataTypes.STRING(64), allowNull: false, defaultValue: 'Europe/London' },
				notifyDigest: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
				notifyStatuses: {
					type: DataTypes.JSON,
					allowNull: false,
					defaultValue: ['over_line', 'crossing_soon']
				},
				crossingWindowDays: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 30 },
				adviceOptOut: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
				active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'users' }
		);
	}
}
