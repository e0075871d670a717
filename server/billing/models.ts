import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { SubscriptionStatus } from '../../shared/billing/plans';

/** A workspace's standing with the payment service (migration 0004-billing). No row: free plan. */
export class BillingAccount extends Model<InferAttributes<BillingAccount>, InferCreationAttributes<BillingAccount>> {
  declare workspaceId: number;
  declare customerId: CreationOptional<string | null>;
  declare subscriptionId: CreationOptional<string | null>;
  declare subscriptionItemId: CreationOptional<string | null>;
  declare status: CreationOptional<SubscriptionStatus>;
  declare quantity: CreationOptional<number>;
  declare cancelAtPeriodEnd: CreationOptional<boolean>;
  declare currentPeriodEnd: CreationOptional<Date | null>;
  declare trialEnd: CreationOptional<Date | null>;
  declare checkoutSessionId: CreationOptional<string | null>;
  declare checkoutUrl: CreationOptional<string | null>;
  declare checkoutExpiresAt: CreationOptional<Date | null>;
  declare lastPaymentError: CreationOptional<string | null>;
  declare subscriptionEventAt: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** One received webhook event; its id is the primary key, which makes handling idempotent. */
export class BillingEvent extends Model<InferAttributes<BillingEvent>, InferCreationAttributes<BillingEvent>> {
  declare id: string;
  declare workspaceId: number | null;
  declare type: string;
  declare eventCreated: number;
  declare outcome: string;
  declare payload: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initBillingModels(sequelize: Sequelize): void {
  BillingAccount.init(
    {
      workspaceId: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
      customerId: DataTypes.STRING(255),
      subscriptionId: DataTypes.STRING(255),
      subscriptionItemId: DataTypes.STRING(255),
      status: { type: DataTypes.STRING(32), defaultValue: 'none' },
      quantity: { type: DataTypes.INTEGER.UNSIGNED, defaultValue: 0 },
      cancelAtPeriodEnd: { type: DataTypes.BOOLEAN, defaultValue: false },
      currentPeriodEnd: DataTypes.DATE,
      trialEnd: DataTypes.DATE,
      checkoutSessionId: DataTypes.STRING(255),
      checkoutUrl: DataTypes.STRING(1000),
      checkoutExpiresAt: DataTypes.DATE,
      lastPaymentError: DataTypes.STRING(500),
      subscriptionEventAt: DataTypes.INTEGER.UNSIGNED,
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'billing_accounts', underscored: true },
  );
  BillingEvent.init(
    {
      id: { type: DataTypes.STRING(255), primaryKey: true },
      workspaceId: DataTypes.INTEGER.UNSIGNED,
      type: DataTypes.STRING(100),
      eventCreated: DataTypes.INTEGER.UNSIGNED,
      outcome: DataTypes.STRING(255),
      payload: DataTypes.TEXT('medium'),
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'billing_events', underscored: true },
  );
}
