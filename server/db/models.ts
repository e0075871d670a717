import { initRosterModels } from '../rosters/models';
import { initBillingModels } from '../billing/models';
import { initStaffModels } from '../staff/models';
import { initAbsenceModels } from '../absences/models';
import { initTermModels } from '../terms/models';
import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type CreationOptional, type Sequelize } from 'sequelize';
import { initLearningModels } from '../learning/models';
import { initSwapModels } from '../swaps/models';
import { initExportModels } from '../exports/models';

export type Role = 'admin' | 'coordinator' | 'staff';

export class Workspace extends Model<InferAttributes<Workspace>, InferCreationAttributes<Workspace>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare timeZone: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare displayName: string;
  declare passwordHash: string | null;
  declare googleId: CreationOptional<string | null>;
  declare emailVerified: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Membership extends Model<InferAttributes<Membership>, InferCreationAttributes<Membership>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare userId: number;
  declare role: Role;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Skill extends Model<InferAttributes<Skill>, InferCreationAttributes<Skill>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare name: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Person extends Model<InferAttributes<Person>, InferCreationAttributes<Person>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare userId: CreationOptional<number | null>;
  declare name: string;
  declare email: CreationOptional<string | null>;
  declare contractedHours: number;
  /** Skill ids of this workspace. */
  declare skills: number[];
  /** Set when a person who was rostered is "deleted": hidden from lists, kept for history. */
  declare archivedAt: CreationOptional<Date | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

const timestamps = { createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE };
const pk = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };

/** Binds the model classes to a connection; the schema itself comes from migrations, never sync(). */
export function initModels(sequelize: Sequelize): void {
  Workspace.init(
    { id: pk, name: DataTypes.STRING(120), timeZone: DataTypes.STRING(64), ...timestamps },
    { sequelize, tableName: 'workspaces', underscored: true },
  );
  User.init(
    {
      id: pk,
      email: DataTypes.STRING(254),
      displayName: DataTypes.STRING(120),
      passwordHash: DataTypes.STRING(100),
      googleId: DataTypes.STRING(64),
      emailVerified: DataTypes.BOOLEAN,
      ...timestamps,
    },
    { sequelize, tableName: 'users', underscored: true, defaultScope: { attributes: { exclude: ['passwordHash'] } }, scopes: { withPassword: {} } },
  );
  Membership.init(
    { id: pk, workspaceId: DataTypes.INTEGER.UNSIGNED, userId: DataTypes.INTEGER.UNSIGNED, role: DataTypes.ENUM('admin', 'coordinator', 'staff'), ...timestamps },
    { sequelize, tableName: 'memberships', underscored: true },
  );
  Skill.init(
    { id: pk, workspaceId: DataTypes.INTEGER.UNSIGNED, name: DataTypes.STRING(80), ...timestamps },
    { sequelize, tableName: 'skills', underscored: true },
  );
  Person.init(
    {
      id: pk,
      workspaceId: DataTypes.INTEGER.UNSIGNED,
      userId: DataTypes.INTEGER.UNSIGNED,
      name: DataTypes.STRING(120),
      email: DataTypes.STRING(254),
      contractedHours: {
        type: DataTypes.DECIMAL(5, 2),
        // DECIMAL arrives as a string from the driver; callers want a number.
        get() {
          const raw = this.getDataValue('contractedHours') as unknown;
          return raw === null || raw === undefined ? 0 : Number(raw);
        },
      },
      skills: {
        type: DataTypes.JSON,
        get() {
          const raw = this.getDataValue('skills') as unknown;
          return typeof raw === 'string' ? JSON.parse(raw) : raw;
        },
      },
      archivedAt: DataTypes.DATE,
      version: { type: DataTypes.INTEGER.UNSIGNED, defaultValue: 1 },
      ...timestamps,
    },
    { sequelize, tableName: 'people', underscored: true },
  );
  Membership.belongsTo(User, { foreignKey: 'userId' });
  Membership.belongsTo(Workspace, { foreignKey: 'workspaceId' });
  User.hasMany(Membership, { foreignKey: 'userId' });
  initRosterModels(sequelize);
  initBillingModels(sequelize);
  initStaffModels(sequelize);
  initAbsenceModels(sequelize);
  initTermModels(sequelize);
  initLearningModels(sequelize);
  initSwapModels(sequelize);
  initExportModels(sequelize);
}
