import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';
import { ORGANISATION_KINDS, type OrganisationKind } from '../../../domain/vocabulary';

export class Organisation extends Model<
	InferAttributes<Organisation>,
	InferCreationAttributes<Organisation>
> {
	declare id: CreationOptional<number>;
	declare name: string;
	declare kind: OrganisationKind;
	declare timeZone: CreationOptional<string>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		Organisation.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				name: { type: DataTypes.STRING(160), allowNull: false },
				kind: {
					type: DataTypes.STRING(16),
					allowNull: false,
					validate: { isIn: [ORGANISATION_KINDS] }
				},
				timeZone: { type: DataTypes.STRING(64), allowNull: false, defaultValue: 'Europe/London' },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'organisations' }
		);
	}
}
