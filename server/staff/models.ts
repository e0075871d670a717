import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** One private calendar feed per person; the token itself is never stored, only its SHA-256. */
export class CalendarFeedRow extends Model<InferAttributes<CalendarFeedRow>, InferCreationAttributes<CalendarFeedRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare personId: number;
  declare tokenHash: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

const pk = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const int = DataTypes.INTEGER.UNSIGNED;

export function initStaffModels(sequelize: Sequelize): void {
  CalendarFeedRow.init(
    { id: pk, workspaceId: int, personId: int, tokenHash: DataTypes.CHAR(64), createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE },
    { sequelize, tableName: 'calendar_feeds', underscored: true },
  );
}
