import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type ModelStatic, type Sequelize } from 'sequelize';
import type { Role } from '../db/models';

export type TokenPurpose = 'password-reset' | 'confirm-email';

/** A single-use, expiring link sent by e-mail; only the SHA-256 of the token is stored. */
export class AccountToken extends Model<InferAttributes<AccountToken>, InferCreationAttributes<AccountToken>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare purpose: TokenPurpose;
  declare tokenHash: string;
  /** For `confirm-email`: the address being confirmed (the new one when changing e-mail). */
  declare email: CreationOptional<string | null>;
  declare expiresAt: Date;
  declare usedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Invitation extends Model<InferAttributes<Invitation>, InferCreationAttributes<Invitation>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare email: string;
  declare role: Role;
  declare personId: CreationOptional<number | null>;
  declare invitedBy: CreationOptional<number | null>;
  declare tokenHash: string;
  declare expiresAt: Date;
  declare acceptedAt: CreationOptional<Date | null>;
  declare acceptedBy: CreationOptional<number | null>;
  declare revokedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/**
 * A sign-up waiting for its e-mailed link. `existingUserId` marks one made for an address that
 * already had an account: its token is never sent, so it can never be finished.
 */
export class SignUpRequest extends Model<InferAttributes<SignUpRequest>, InferCreationAttributes<SignUpRequest>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare tokenHash: string;
  declare existingUserId: CreationOptional<number | null>;
  declare displayName: CreationOptional<string | null>;
  declare workspaceName: CreationOptional<string | null>;
  declare timeZone: CreationOptional<string | null>;
  declare passwordHash: CreationOptional<string | null>;
  declare expiresAt: Date;
  declare usedAt: CreationOptional<Date | null>;
  declare userId: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class SignInAttempt extends Model<InferAttributes<SignInAttempt>, InferCreationAttributes<SignInAttempt>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare address: string;
  declare succeeded: boolean;
  declare createdAt: CreationOptional<Date>;
}

const pk = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const timestamps = { createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE };

/**
 * Binds the account models (and the session store's model) to a connection. createApp calls it,
 * so the schema stays in migrations and no other entry point has to remember it.
 */
export function initAccountModels(sequelize: Sequelize): ModelStatic<Model> {
  if (AccountToken.sequelize !== sequelize) {
    AccountToken.init(
      {
        id: pk,
        userId: DataTypes.INTEGER.UNSIGNED,
        purpose: DataTypes.ENUM('password-reset', 'confirm-email'),
        tokenHash: DataTypes.CHAR(64),
        email: DataTypes.STRING(254),
        expiresAt: DataTypes.DATE,
        usedAt: DataTypes.DATE,
        ...timestamps,
      },
      { sequelize, tableName: 'account_tokens', underscored: true },
    );
    Invitation.init(
      {
        id: pk,
        workspaceId: DataTypes.INTEGER.UNSIGNED,
        email: DataTypes.STRING(254),
        role: DataTypes.ENUM('admin', 'coordinator', 'staff'),
        personId: DataTypes.INTEGER.UNSIGNED,
        invitedBy: DataTypes.INTEGER.UNSIGNED,
        tokenHash: DataTypes.CHAR(64),
        expiresAt: DataTypes.DATE,
        acceptedAt: DataTypes.DATE,
        acceptedBy: DataTypes.INTEGER.UNSIGNED,
        revokedAt: DataTypes.DATE,
        ...timestamps,
      },
      { sequelize, tableName: 'invitations', underscored: true },
    );
    SignUpRequest.init(
      {
        id: pk,
        email: DataTypes.STRING(254),
        tokenHash: DataTypes.CHAR(64),
        existingUserId: DataTypes.INTEGER.UNSIGNED,
        displayName: DataTypes.STRING(120),
        workspaceName: DataTypes.STRING(120),
        timeZone: DataTypes.STRING(64),
        passwordHash: DataTypes.STRING(100),
        expiresAt: DataTypes.DATE,
        usedAt: DataTypes.DATE,
        userId: DataTypes.INTEGER.UNSIGNED,
        ...timestamps,
      },
      { sequelize, tableName: 'sign_up_requests', underscored: true },
    );
    SignInAttempt.init(
      { id: { ...pk, type: DataTypes.BIGINT.UNSIGNED }, email: DataTypes.STRING(254), address: DataTypes.STRING(64), succeeded: DataTypes.BOOLEAN, createdAt: DataTypes.DATE },
      { sequelize, tableName: 'sign_in_attempts', underscored: true, updatedAt: false },
    );
  }
  // connect-session-sequelize looks the model up by this key in sequelize.models.
  return (
    sequelize.models.Session ??
    sequelize.define(
      'Session',
      { sid: { type: DataTypes.STRING(36), primaryKey: true }, expires: DataTypes.DATE, data: DataTypes.TEXT, userId: DataTypes.INTEGER.UNSIGNED },
      { tableName: 'sessions', underscored: true },
    )
  );
}
