import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { RuleSet } from '../../shared/roster/schema';

type Attrs<M extends Model> = InferAttributes<M>;
type Creation<M extends Model> = InferCreationAttributes<M>;

export type RosterStatus = 'draft' | 'solved' | 'published';
export type RunStatus = 'queued' | 'running' | 'done' | 'failed' | 'cancelled';

export class Roster extends Model<Attrs<Roster>, Creation<Roster>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare name: string;
  declare periodStart: string;
  declare periodEnd: string;
  declare timeZone: string;
  declare status: CreationOptional<RosterStatus>;
  declare rules: RuleSet;
  declare wishDeadline: CreationOptional<Date | null>;
  declare maxCannotDays: CreationOptional<number | null>;
  declare publishedRunId: CreationOptional<number | null>;
  declare publishedAt: CreationOptional<Date | null>;
  /** What was published, as the exports write it (server/rosters/publish.ts PublishedSnapshot). */
  declare publishedSnapshot: CreationOptional<object | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class ShiftPatternRow extends Model<Attrs<ShiftPatternRow>, Creation<ShiftPatternRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare rosterId: number;
  declare label: string;
  declare weekdays: string[];
  declare startTime: string;
  declare endTime: string;
  /** [{ skillId: number | null, count }] */
  declare seats: Array<{ skillId: number | null; count: number }>;
  declare night: CreationOptional<boolean | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class ShiftRow extends Model<Attrs<ShiftRow>, Creation<ShiftRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare rosterId: number;
  declare patternId: CreationOptional<number | null>;
  declare label: string;
  declare startsLocal: string;
  declare endsLocal: string;
  declare night: CreationOptional<boolean | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class SeatRow extends Model<Attrs<SeatRow>, Creation<SeatRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare shiftId: number;
  declare skillId: number | null;
  declare position: number;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class WishRow extends Model<Attrs<WishRow>, Creation<WishRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare rosterId: number;
  declare personId: number;
  declare date: CreationOptional<string | null>;
  declare shiftId: CreationOptional<number | null>;
  declare kind: 'prefer' | 'avoid' | 'cannot';
  declare strength: CreationOptional<number>;
  declare note: CreationOptional<string | null>;
  /** Who typed it: the person themself, or a coordinator on their behalf; null for seeded or imported wishes. */
  declare enteredByUserId: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class PairingRow extends Model<Attrs<PairingRow>, Creation<PairingRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare personAId: number;
  declare personBId: number;
  declare score: number;
  declare neverTogether: CreationOptional<boolean>;
  declare status: CreationOptional<'approved' | 'requested' | 'declined'>;
  declare reason: CreationOptional<string | null>;
  /** The staff member who asked for it (migration 0005); null when a coordinator made it. */
  declare requestedByPersonId: CreationOptional<number | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class PinRow extends Model<Attrs<PinRow>, Creation<PinRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare rosterId: number;
  declare seatId: number;
  declare personId: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class RunRow extends Model<Attrs<RunRow>, Creation<RunRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare rosterId: number;
  declare status: CreationOptional<RunStatus>;
  declare parameters: { timeLimitSeconds: number; seed: number };
  declare progress: CreationOptional<{ iteration: number; score: number; bound: number; gap: number; elapsedMs: number } | null>;
  declare score: CreationOptional<number | null>;
  declare bound: CreationOptional<number | null>;
  declare gap: CreationOptional<number | null>;
  declare rosterVersion: number;
  declare cancelRequested: CreationOptional<boolean>;
  declare claimedBy: CreationOptional<string | null>;
  declare heartbeatAt: CreationOptional<Date | null>;
  declare startedAt: CreationOptional<Date | null>;
  declare finishedAt: CreationOptional<Date | null>;
  declare timeMs: CreationOptional<number | null>;
  declare error: CreationOptional<string | null>;
  declare result: CreationOptional<object | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class AssignmentRow extends Model<Attrs<AssignmentRow>, Creation<AssignmentRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare runId: number;
  declare seatId: number;
  declare personId: number | null;
  declare pinned: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

const pk = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
/** Column helpers shared by the workspace-scoped models (here and server/swaps/models.ts). */
export const int = DataTypes.INTEGER.UNSIGNED;
// Defaults repeated from the migration so a freshly created instance carries them without a reload.
export const version = { type: DataTypes.INTEGER.UNSIGNED, defaultValue: 1 };
export const common = { id: pk, workspaceId: int, createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE };
export const opts = (sequelize: Sequelize, tableName: string) => ({ sequelize, tableName, underscored: true });
/** The driver hands JSON columns back as strings on MariaDB (JSON is LONGTEXT there). */
export const json = (name: string) => ({
  type: DataTypes.JSON,
  get(this: Model) {
    const raw = this.getDataValue(name) as unknown;
    return typeof raw === 'string' ? JSON.parse(raw) : raw;
  },
});

export function initRosterModels(sequelize: Sequelize): void {
  Roster.init(
    {
      ...common,
      name: DataTypes.STRING(120),
      periodStart: DataTypes.DATEONLY,
      periodEnd: DataTypes.DATEONLY,
      timeZone: DataTypes.STRING(64),
      status: { type: DataTypes.ENUM('draft', 'solved', 'published'), defaultValue: 'draft' },
      rules: json('rules'),
      wishDeadline: DataTypes.DATE,
      maxCannotDays: int,
      publishedRunId: int,
      publishedAt: DataTypes.DATE,
      publishedSnapshot: json('publishedSnapshot'),
      version,
    },
    opts(sequelize, 'rosters'),
  );
  ShiftPatternRow.init(
    { ...common, rosterId: int, label: DataTypes.STRING(60), weekdays: json('weekdays'), startTime: DataTypes.STRING(5), endTime: DataTypes.STRING(5), seats: json('seats'), night: DataTypes.BOOLEAN, version },
    opts(sequelize, 'shift_patterns'),
  );
  ShiftRow.init(
    { ...common, rosterId: int, patternId: int, label: DataTypes.STRING(60), startsLocal: DataTypes.STRING(19), endsLocal: DataTypes.STRING(19), night: DataTypes.BOOLEAN, version },
    opts(sequelize, 'shifts'),
  );
  SeatRow.init({ ...common, shiftId: int, skillId: int, position: int }, opts(sequelize, 'seats'));
  WishRow.init(
    { ...common, rosterId: int, personId: int, date: DataTypes.DATEONLY, shiftId: int, kind: DataTypes.ENUM('prefer', 'avoid', 'cannot'), strength: { type: DataTypes.DOUBLE, defaultValue: 1 }, note: DataTypes.STRING(500), enteredByUserId: int },
    opts(sequelize, 'wishes'),
  );
  PairingRow.init(
    { ...common, personAId: int, personBId: int, score: DataTypes.DOUBLE, neverTogether: { type: DataTypes.BOOLEAN, defaultValue: false }, status: { type: DataTypes.ENUM('approved', 'requested', 'declined'), defaultValue: 'approved' }, reason: DataTypes.STRING(500), requestedByPersonId: int, version },
    opts(sequelize, 'pairings'),
  );
  PinRow.init({ ...common, rosterId: int, seatId: int, personId: int }, opts(sequelize, 'pins'));
  RunRow.init(
    {
      ...common,
      rosterId: int,
      status: { type: DataTypes.ENUM('queued', 'running', 'done', 'failed', 'cancelled'), defaultValue: 'queued' },
      parameters: json('parameters'),
      progress: json('progress'),
      score: DataTypes.DOUBLE,
      bound: DataTypes.DOUBLE,
      gap: DataTypes.DOUBLE,
      rosterVersion: int,
      cancelRequested: { type: DataTypes.BOOLEAN, defaultValue: false },
      claimedBy: DataTypes.STRING(80),
      heartbeatAt: DataTypes.DATE,
      startedAt: DataTypes.DATE,
      finishedAt: DataTypes.DATE,
      timeMs: int,
      error: DataTypes.TEXT,
      result: json('result'),
    },
    opts(sequelize, 'runs'),
  );
  AssignmentRow.init({ ...common, runId: int, seatId: int, personId: int, pinned: { type: DataTypes.BOOLEAN, defaultValue: false } }, opts(sequelize, 'assignments'));
}
