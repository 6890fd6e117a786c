import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** One change to a booking: who, when, what it became and why. */
export class BookingChange extends Model<
	InferAttributes<BookingChange>,
	InferCreationAttributes<BookingChange>
> {
	declare id: CreationOptional<number>;
	declare bookingId: number;
	declare userId: number | null;
	declare at: Date;
	declare action: string;
	declare fromState: string | null;
	declare toState: string;
	declare startsAt: Date | null;
	declare endsAt: Date | null;
	declare sequence: number;
	declare reason: string | null;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		BookingChange.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				bookingId: { type: DataTypes.INTEGER, allowNull: false },
				userId: { type: DataTypes.INTEGER, allowNull: true },
				at: { type: DataTypes.DATE, allowNull: false },
				action: { type: DataTypes.STRING(16), allowNull: false },
				fromState: { type: DataTypes.STRING(16), allowNull: true },
				toState: { type: DataTypes.STRING(16), allowNull: false },
				startsAt: { type: DataTypes.DATE, allowNull: true },
				endsAt: { type: DataTypes.DATE, allowNull: true },
				sequence: { type: DataTypes.INTEGER, allowNull: false },
				reason: { type: DataTypes.TEXT, allowNull: true },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'booking_changes' }
		);
	}
}
