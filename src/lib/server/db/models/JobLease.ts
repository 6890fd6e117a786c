import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** Who may run a job right now; a lease expires if its holder dies. */
export class JobLease extends Model<InferAttributes<JobLease>, InferCreationAttributes<JobLease>> {
	declare job: string;
	declare holder: string;
	declare expiresAt: Date;
	declare createdAt: CreationOptional<Date>;
	declare updatedAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		JobLease.init(
			{
				job: { type: DataTypes.STRING(40), primaryKey: true },
				holder: { type: DataTypes.STRING(80), allowNull: false },
				expiresAt: { type: DataTypes.DATE, allowNull: false },
				createdAt: DataTypes.DATE,
				updatedAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'job_leases' }
		);
	}
}
