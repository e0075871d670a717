import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { AbsenceKindName, AbsenceSettings, AbsenceStatus } from '../../shared/api/absences';

/** Time away of one person (migration 0007). Dates are local to the workspace; end_date is inclusive. */
export class AbsenceRow extends Model<InferAttributes<AbsenceRow>, InferCreationAttributes<AbsenceRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare personId: number;
  declare kind: AbsenceKindName;
  declare startDate: string;
  declare endDate: string;
  declare startTime: CreationOptional<string | null>;
  declare endTime: CreationOptional<string | null>;
  declare creditHours: CreationOptional<number | null>;
  declare note: CreationOptional<string | null>;
  declare status: AbsenceStatus;
  declare requestedByUserId: CreationOptional<number | null>;
  declare decidedByUserId: CreationOptional<number | null>;
  declare decidedAt: CreationOptional<Date | null>;
  declare declineReason: CreationOptional<string | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** Per-kind credit defaults of a workspace; no row means DEFAULT_ABSENCE_CREDITS. */
export class AbsenceSettingsRow extends Model<InferAttributes<AbsenceSettingsRow>, InferCreationAttributes<AbsenceSettingsRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare credits: AbsenceSettings['credits'];
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

const pk = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const int = DataTypes.INTEGER.UNSIGNED;
const timestamps = { createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE };

export function initAbsenceModels(sequelize: Sequelize): void {
  AbsenceRow.init(
    {
      id: pk,
      workspaceId: int,
      personId: int,
      kind: DataTypes.ENUM('annual', 'sick', 'training', 'parental', 'other'),
      startDate: DataTypes.DATEONLY,
      endDate: DataTypes.DATEONLY,
      startTime: DataTypes.STRING(5),
      endTime: DataTypes.STRING(5),
      creditHours: {
        type: DataTypes.DECIMAL(7, 2),
        // DECIMAL arrives as a string from the driver.
        get(this: AbsenceRow) {
          const raw = this.getDataValue('creditHours') as unknown;
          return raw === null || raw === undefined ? null : Number(raw);
        },
      },
      note: DataTypes.STRING(500),
      status: { type: DataTypes.ENUM('requested', 'approved', 'declined'), defaultValue: 'approved' },
      requestedByUserId: int,
      decidedByUserId: int,
      decidedAt: DataTypes.DATE,
      declineReason: DataTypes.STRING(500),
      version: { type: int, defaultValue: 1 },
      ...timestamps,
    },
    { sequelize, tableName: 'absences', underscored: true },
  );
  AbsenceSettingsRow.init(
    {
      id: pk,
      workspaceId: int,
      credits: {
        type: DataTypes.JSON,
        // MariaDB keeps JSON as LONGTEXT, so the driver hands back a string.
        get(this: AbsenceSettingsRow) {
          const raw = this.getDataValue('credits') as unknown;
          return typeof raw === 'string' ? JSON.parse(raw) : raw;
        },
      },
      version: { type: int, defaultValue: 1 },
      ...timestamps,
    },
    { sequelize, tableName: 'absence_settings', underscored: true },
  );
}
