import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { Term } from '../../shared/roster/schema';

/** A per-person term with the date it takes effect (table from migration 0007). */
export class PersonTermRow extends Model<InferAttributes<PersonTermRow>, InferCreationAttributes<PersonTermRow>> {
  declare id: CreationOptional<number>;
  declare workspaceId: number;
  declare personId: number;
  declare term: Term;
  declare effectiveFrom: string;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initTermModels(sequelize: Sequelize): void {
  PersonTermRow.init(
    {
      id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
      workspaceId: DataTypes.INTEGER.UNSIGNED,
      personId: DataTypes.INTEGER.UNSIGNED,
      term: {
        type: DataTypes.JSON,
        // MariaDB keeps JSON as LONGTEXT, so the driver hands back a string.
        get() {
          const raw = this.getDataValue('term') as unknown;
          return typeof raw === 'string' ? JSON.parse(raw) : raw;
        },
      },
      effectiveFrom: DataTypes.DATEONLY,
      version: { type: DataTypes.INTEGER.UNSIGNED, defaultValue: 1 },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'person_terms', underscored: true },
  );
}
