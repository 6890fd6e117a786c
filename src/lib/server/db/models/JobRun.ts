import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

export class JobRun extends Model<InferAttributes<JobRun>, InferCreationAttributes<JobRun>> {
	declare id: CreationOptional<number>;
	declare job: string;
	declare startedAt: Date;
	declare finishedAt: CreationOptional<Date | null>;
	declare state: CreationOptional<'running' | 'done' | 'failed'>;
	declare summary: CreationOptional<Record<string, unknown> | null>;

	static initModel(sequelize: Sequelize): void {
		JobRun.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				job: { type: DataTypes.STRING(40), allowNull: false },
				startedAt: { type: DataTypes.DATE, allowNull: false },
				finishedAt: { type: DataTypes.DATE, allowNull: true },
				state: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'running' },
				summary: { type: DataTypes.JSON, allowNull: true }
			},
			{ sequelize, tableName: 'job_runs', timestamps: false }
		);
	}
}
