import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** One bay on one day held by a booking; unique per (workshop, day, bay). */
export class BookingSlot extends Model<
	InferAttributes<BookingSlot>,
	InferCreationAttributes<BookingSlot>
> {
	declare id: CreationOptional<number>;
	declare bookingId: number;
	declare workshopId: number;
	declare day: string;
	declare bay: number;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		BookingSlot.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				bookingId: { type: DataTypes.INTEGER, allowNull: false },
				workshopId: { type: DataTypes.INTEGER, allowNull: false },
				day: { type: DataTypes.STRING(10), allowNull: false },
				bay: { type: DataTypes.INTEGER, allowNull: false },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'booking_slots' }
		);
	}
}
