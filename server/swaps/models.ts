import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { ChangeCheck } from '../../shared/api/swaps';
import { common, int, json, opts, version } from '../rosters/models';

type Attrs<M extends Model> = InferAttributes<M>;
type Creation<M extends Model> = InferCreationAttributes<M>;

export type SwapStatus = 'proposed' | 'accepted' | 'approved' | 'refused' | 'declined' | 'withdrawn';
export type OfferStatus = 'open' | 'taken' | 'approved' | 'refused' | 'withdrawn';

/** A swap (my seat for theirs) or a giveaway (my seat to them) on a published roster (migration 0011). */
export class SwapRow extends Model<Attrs<SwapRow>, Creation<SwapRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare rosterId: number;
  declare kind: 'swap' | 'giveaway';
  declare proposerPersonId: number;
  declare proposerSeatId: number;
  declare colleaguePersonId: number;
  declare colleagueSeatId: CreationOptional<number | null>;
  declare status: CreationOptional<SwapStatus>;
  declare checkResult: ChangeCheck;
  declare baseRunId: CreationOptional<number | null>;
  declare resultRunId: CreationOptional<number | null>;
  declare decidedByUserId: CreationOptional<number | null>;
  declare decidedAt: CreationOptional<Date | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** An open seat of a published roster offered to the staff eligible for it. */
export class OfferRow extends Model<Attrs<OfferRow>, Creation<OfferRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare rosterId: number;
  declare seatId: number;
  declare status: CreationOptional<OfferStatus>;
  declare eligible: number[];
  declare takerPersonId: CreationOptional<number | null>;
  declare takenAt: CreationOptional<Date | null>;
  declare checkResult: CreationOptional<ChangeCheck | null>;
  declare baseRunId: CreationOptional<number | null>;
  declare resultRunId: CreationOptional<number | null>;
  declare createdByUserId: CreationOptional<number | null>;
  declare decidedAt: CreationOptional<Date | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** Where a workspace's public holidays come from, and the weights the ledger gives the next roster. */
export class LedgerSettingsRow extends Model<Attrs<LedgerSettingsRow>, Creation<LedgerSettingsRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare region: CreationOptional<string | null>;
  declare nightWeight: CreationOptional<number>;
  declare weekendWeight: CreationOptional<number>;
  declare lookbackDays: CreationOptional<number>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class HolidayRow extends Model<Attrs<HolidayRow>, Creation<HolidayRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare date: string;
  declare name: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initSwapModels(sequelize: Sequelize): void {
  SwapRow.init(
    {
      ...common,
      rosterId: int,
      kind: DataTypes.ENUM('swap', 'giveaway'),
      proposerPersonId: int,
      proposerSeatId: int,
      colleaguePersonId: int,
      colleagueSeatId: int,
      status: { type: DataTypes.ENUM('proposed', 'accepted', 'approved', 'refused', 'declined', 'withdrawn'), defaultValue: 'proposed' },
      checkResult: json('checkResult'),
      baseRunId: int,
      resultRunId: int,
      decidedByUserId: int,
      decidedAt: DataTypes.DATE,
      version,
    },
    opts(sequelize, 'swaps'),
  );
  OfferRow.init(
    {
      ...common,
      rosterId: int,
      seatId: int,
      status: { type: DataTypes.ENUM('open', 'taken', 'approved', 'refused', 'withdrawn'), defaultValue: 'open' },
      eligible: json('eligible'),
      takerPersonId: int,
      takenAt: DataTypes.DATE,
      checkResult: json('checkResult'),
      baseRunId: int,
      resultRunId: int,
      createdByUserId: int,
      decidedAt: DataTypes.DATE,
      version,
    },
    opts(sequelize, 'offers'),
  );
  LedgerSettingsRow.init(
    { ...common, region: DataTypes.STRING(20), nightWeight: { type: DataTypes.DOUBLE, defaultValue: 3 }, weekendWeight: { type: DataTypes.DOUBLE, defaultValue: 3 }, lookbackDays: { type: DataTypes.INTEGER.UNSIGNED, defaultValue: 91 }, version },
    opts(sequelize, 'ledger_settings'),
  );
  HolidayRow.init({ ...common, date: DataTypes.DATEONLY, name: DataTypes.STRING(120) }, opts(sequelize, 'holidays'));
}
