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

/**
 * The pairings table seen from a staff member's side: their own requests. It maps the same table
 * as PairingRow (server/rosters/models.ts) plus the requester column added in migration 0005.
 */
export class PairingRequestRow extends Model<InferAttributes<PairingRequestRow>, InferCreationAttributes<PairingRequestRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare personAId: number;
  declare personBId: number;
  declare score: number;
  declare neverTogether: CreationOptional<boolean>;
  declare status: CreationOptional<'approved' | 'requested' | 'declined'>;
  declare reason: CreationOptional<string | null>;
  declare requestedByPersonId: CreationOptional<number | null>;
  declare version: CreationOptional<number>;
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
  PairingRequestRow.init(
    {
      id: pk,
      workspaceId: int,
      personAId: int,
      personBId: int,
      score: DataTypes.DOUBLE,
      neverTogether: { type: DataTypes.BOOLEAN, defaultValue: false },
      status: { type: DataTypes.ENUM('approved', 'requested', 'declined'), defaultValue: 'approved' },
      reason: DataTypes.STRING(500),
      requestedByPersonId: int,
      version: { type: DataTypes.INTEGER.UNSIGNED, defaultValue: 1 },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'pairings', underscored: true },
  );
}
