import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export type ExportKind = 'roster-pdf' | 'roster-csv' | 'roster-ics' | 'people-csv';
export type ExportStatus = 'queued' | 'running' | 'done' | 'failed';

/** A file prepared by a worker (migration 0014); see server/exports/jobs.ts. */
export class ExportFile extends Model<InferAttributes<ExportFile>, InferCreationAttributes<ExportFile>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare kind: ExportKind;
  declare params: string;
  declare status: CreationOptional<ExportStatus>;
  declare filename: CreationOptional<string | null>;
  declare contentType: CreationOptional<string | null>;
  declare body: CreationOptional<Buffer | null>;
  declare bytes: CreationOptional<number | null>;
  declare error: CreationOptional<string | null>;
  declare errorStatus: CreationOptional<number | null>;
  declare claimedBy: CreationOptional<string | null>;
  declare startedAt: CreationOptional<Date | null>;
  declare finishedAt: CreationOptional<Date | null>;
  declare timeMs: CreationOptional<number | null>;
  declare expiresAt: Date;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initExportModels(sequelize: Sequelize): void {
  const int = DataTypes.INTEGER.UNSIGNED;
  ExportFile.init(
    {
      id: { type: int, autoIncrement: true, primaryKey: true },
      workspaceId: int,
      kind: DataTypes.STRING(20),
      params: DataTypes.STRING(500),
      status: { type: DataTypes.ENUM('queued', 'running', 'done', 'failed'), defaultValue: 'queued' },
      filename: DataTypes.STRING(200),
      contentType: DataTypes.STRING(80),
      body: DataTypes.BLOB('long'),
      bytes: int,
      error: DataTypes.TEXT,
      errorStatus: DataTypes.SMALLINT.UNSIGNED,
      claimedBy: DataTypes.STRING(80),
      startedAt: DataTypes.DATE(3),
      finishedAt: DataTypes.DATE(3),
      timeMs: int,
      expiresAt: DataTypes.DATE(3),
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    // The bytes are read only when the file is handed over, never with the status.
    { sequelize, tableName: 'exports', underscored: true, defaultScope: { attributes: { exclude: ['body'] } }, scopes: { withBody: {} } },
  );
}
