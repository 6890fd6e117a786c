import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';
import { BOOKING_STATES, type BookingState } from '../../../domain/vocabulary';

/** A preventive visit, from request to done; uid and sequence feed the calendar invitations. */
export class Booking extends Model<InferAttributes<Booking>, InferCreationAttributes<Booking>> {
	declare id: CreationOptional<number>;
	declare uid: string;
	declare vehicleId: number;
	declare workshopId: number;
	declare requestedById: number;
	declare visitKind: string;
	declare state: CreationOptional<BookingState>;
	declare startsAt: CreationOptional<Date | null>;
	declare endsAt: CreationOptional<Date | null>;
	declare windowFrom: CreationOptional<Date | null>;
	declare windowTo: CreationOptional<Date | null>;
	declare sequence: CreationOptional<number>;
	declare reason: CreationOptional<string | null>;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		Booking.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				uid: { type: DataTypes.STRING(120), allowNull: false, unique: true },
				vehicleId: { type: DataTypes.INTEGER, allowNull: false },
				workshopId: { type: DataTypes.INTEGER, allowNull: false },
				requestedById: { type: DataTypes.INTEGER, allowNull: false },
				visitKind: { type: DataTypes.STRING(32), allowNull: false },
				state: {
					type: DataTypes.STRING(16),
					allowNull: false,
					defaultValue: 'requested',
					validate: { isIn: [BOOKING_STATES] }
				},
				startsAt: { type: DataTypes.DATE, allowNull: true },
				endsAt: { type: DataTypes.DATE, allowNull: true },
				windowFrom: { type: DataTypes.DATE, allowNull: true },
				windowTo: { type: DataTypes.DATE, allowNull: true },
				sequence: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
				reason: { type: DataTypes.TEXT, allowNull: true },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'bookings' }
		);
	}
}
