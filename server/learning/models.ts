import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { Roster as RosterJson, RosterAssignment } from '../../shared/roster/schema';
import type { SuggestionReport, WeightChange } from '../../shared/api/suggestion';

type Attrs<M extends Model> = InferAttributes<M>;
type Creation<M extends Model> = InferCreationAttributes<M>;

/** One coordinator edit: the roster kept over the roster proposed (migration 0010). */
export class PreferenceRow extends Model<Attrs<PreferenceRow>, Creation<PreferenceRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare rosterId: number;
  declare source: 'manual' | 'alternative';
  declare keptRunId: number | null;
  declare proposedRunId: number | null;
  declare rosterJson: RosterJson;
  declare kept: RosterAssignment;
  declare proposed: RosterAssignment;
  declare seatsChanged: number;
  declare createdByUserId: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** Weights learned for a roster from the workspace's edits; adopted or dismissed by a coordinator. */
export class SuggestionRow extends Model<Attrs<SuggestionRow>, Creation<SuggestionRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare rosterId: number;
  declare status: CreationOptional<'open' | 'adopted' | 'dismissed'>;
  declare weights: WeightChange[];
  declare report: SuggestionReport;
  declare editCount: number;
  declare rosterCount: number;
  declare rosterVersion: number;
  declare createdByUserId: number | null;
  declare decidedByUserId: CreationOptional<number | null>;
  declare decidedAt: CreationOptional<Date | null>;
  declare rulesBefore: CreationOptional<object | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** The driver hands JSON columns back as strings on MariaDB (JSON is LONGTEXT there). */
const json = (name: string, allowNull = false) => ({
  type: DataTypes.JSON,
  allowNull,
  get(this: Model) {
    const raw = this.getDataValue(name) as unknown;
    return typeof raw === 'string' ? JSON.parse(raw) : raw;
  },
});
const int = DataTypes.INTEGER.UNSIGNED;
const pk = { type: int, autoIncrement: true, primaryKey: true };

export function initLearningModels(sequelize: Sequelize): void {
  const common = { id: pk, workspaceId: int, rosterId: int, createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE };
  PreferenceRow.init(
    { ...common, source: DataTypes.ENUM('manual', 'alternative'), keptRunId: int, proposedRunId: int, rosterJson: json('rosterJson'), kept: json('kept'), proposed: json('proposed'), seatsChanged: int, createdByUserId: int },
    { sequelize, tableName: 'preferences', underscored: true },
  );
  SuggestionRow.init(
    {
      ...common,
      status: { type: DataTypes.ENUM('open', 'adopted', 'dismissed'), defaultValue: 'open' },
      weights: json('weights'),
      report: json('report'),
      editCount: int,
      rosterCount: int,
      rosterVersion: int,
      createdByUserId: int,
      decidedByUserId: int,
      decidedAt: DataTypes.DATE,
      rulesBefore: json('rulesBefore', true),
    },
    { sequelize, tableName: 'weight_suggestions', underscored: true },
  );
}
