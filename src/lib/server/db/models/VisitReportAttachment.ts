import {
	DataTypes,
	Model,
	type CreationOptional,
	type InferAttributes,
	type InferCreationAttributes,
	type Sequelize
} from 'sequelize';

/** A photo or PDF on a visit report; the bytes are in storage under `storageKey`. */
export class VisitReportAttachment extends Model<
	InferAttributes<VisitReportAttachment>,
	InferCreationAttributes<VisitReportAttachment>
> {
	declare id: CreationOptional<number>;
	declare visitReportId: number;
	declare storageKey: string;
	declare fileName: string;
	/** What the content sniffing found, never what the sender claimed. */
	declare mediaType: string;
	declare sizeBytes: number;
	declare sha256: string;
	declare uploadedById: number | null;
	declare createdAt: CreationOptional<Date>;

	static initModel(sequelize: Sequelize): void {
		VisitReportAttachment.init(
			{
				id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
				visitReportId: { type: DataTypes.INTEGER, allowNull: false },
				storageKey: { type: DataTypes.STRING(500), allowNull: false },
				fileName: { type: DataTypes.STRING(255), allowNull: false },
				mediaType: { type: DataTypes.STRING(64), allowNull: false },
				sizeBytes: { type: DataTypes.BIGINT, allowNull: false },
				sha256: { type: DataTypes.STRING(64), allowNull: false },
				uploadedById: { type: DataTypes.INTEGER, allowNull: true },
				createdAt: DataTypes.DATE
			},
			{ sequelize, tableName: 'visit_report_attachments', updatedAt: false }
		);
	}
}
