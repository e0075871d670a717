import { randomBytes } from 'node:crypto';
import type { Sequelize } from 'sequelize';

interface Column {
  name: string;
  dataType: string;
  columnType: string;
  nullable: boolean;
  hasDefault: boolean;
  autoIncrement: boolean;
  maxLength: number | null;
  references: string | null;
}

/**
 * Makes rows in any table of the schema from information_schema alone: required columns get
 * placeholder values, `workspace_id` the given workspace, and required foreign keys a parent row
 * made the same way. So the cross-workspace test covers new tables without anyone writing fixtures.
 */
export class RowMaker {
  private columns = new Map<string, Column[]>();
  /** Every placeholder string written; none may ever show up in another workspace's responses. */
  readonly markers: string[] = [];
  constructor(private readonly sequelize: Sequelize, private readonly database: string) {}

  async tables(): Promise<string[]> {
    const [rows] = await this.sequelize.query('SELECT TABLE_NAME AS t FROM information_schema.TABLES WHERE TABLE_SCHEMA = ?', { replacements: [this.database] });
    return (rows as Array<{ t: string }>).map((r) => r.t);
  }

  private async describe(table: string): Promise<Column[]> {
    const cached = this.columns.get(table);
    if (cached) return cached;
    const [cols] = await this.sequelize.query(
      `SELECT c.COLUMN_NAME AS name, c.DATA_TYPE AS dataType, c.COLUMN_TYPE AS columnType, c.IS_NULLABLE AS nullable, c.COLUMN_DEFAULT AS def,
              c.EXTRA AS extra, c.CHARACTER_MAXIMUM_LENGTH AS maxLength, k.REFERENCED_TABLE_NAME AS ref
         FROM information_schema.COLUMNS c
         LEFT JOIN information_schema.KEY_COLUMN_USAGE k
           ON k.TABLE_SCHEMA = c.TABLE_SCHEMA AND k.TABLE_NAME = c.TABLE_NAME AND k.COLUMN_NAME = c.COLUMN_NAME AND k.REFERENCED_TABLE_NAME IS NOT NULL
        WHERE c.TABLE_SCHEMA = ? AND c.TABLE_NAME = ? ORDER BY c.ORDINAL_POSITION`,
      { replacements: [this.database, table] },
    );
    const described = (cols as Array<Record<string, unknown>>).map((c) => ({
      name: String(c.name),
      dataType: String(c.dataType).toLowerCase(),
      columnType: String(c.columnType).toLowerCase(),
      nullable: c.nullable === 'YES',
      hasDefault: c.def !== null && c.def !== undefined,
      autoIncrement: String(c.extra).includes('auto_increment'),
      maxLength: c.maxLength === null ? null : Number(c.maxLength),
      references: (c.ref as string | null) ?? null,
    }));
    this.columns.set(table, described);
    return described;
  }

  /** Foreign-key columns of `table` and the tables they point at. */
  async foreignKeys(table: string): Promise<Array<{ column: string; table: string }>> {
    return (await this.describe(table)).filter((c) => c.references).map((c) => ({ column: c.name, table: c.references! }));
  }

  private placeholder(c: Column): unknown {
    const marker = `zq${randomBytes(5).toString('hex')}`;
    switch (c.dataType) {
      // MariaDB's JSON is LONGTEXT with a JSON_VALID check; an empty array passes it.
      case 'longtext':
        return '[]';
      case 'varchar':
      case 'char':
      case 'text':
      case 'mediumtext': {
        const value = c.name.includes('email') ? `${marker}@example.test` : marker.slice(0, c.maxLength ?? marker.length);
        this.markers.push(value);
        return value;
      }
      case 'enum':
        return /^enum\('([^']*)'/.exec(c.columnType)?.[1] ?? '';
      case 'tinyint':
        return 0;
      case 'int':
      case 'bigint':
      case 'smallint':
      case 'mediumint':
      case 'double':
      case 'float':
      case 'decimal':
        return 1;
      case 'date':
        return '2031-03-03';
      case 'datetime':
      case 'timestamp':
        return new Date();
      case 'json':
        return '[]';
      default:
        return marker;
    }
  }

  /** Inserts a row; `fixed` wins over everything, `workspace_id` is the workspace, parents are made as needed. */
  async make(table: string, workspaceId: number, fixed: Record<string, unknown> = {}): Promise<number> {
    const values: Record<string, unknown> = {};
    for (const c of await this.describe(table)) {
      if (c.name in fixed) values[c.name] = fixed[c.name];
      else if (c.autoIncrement) continue;
      else if (c.name === 'workspace_id') values[c.name] = workspaceId;
      else if (c.references === 'workspaces') values[c.name] = workspaceId;
      else if (c.references && !c.nullable) values[c.name] = await this.make(c.references, workspaceId);
      else if (c.nullable || c.hasDefault) continue;
      else values[c.name] = this.placeholder(c);
    }
    const cols = Object.keys(values);
    const [id] = await this.sequelize.query(`INSERT INTO \`${table}\` (${cols.map((c) => `\`${c}\``).join(', ')}) VALUES (${cols.map(() => '?').join(', ')})`, {
      replacements: cols.map((c) => values[c]),
    });
    return Number(id);
  }

  async exists(table: string, id: number): Promise<boolean> {
    const [rows] = await this.sequelize.query(`SELECT 1 AS x FROM \`${table}\` WHERE id = ?`, { replacements: [id] });
    return (rows as unknown[]).length > 0;
  }
}

/** The table behind a path segment: `people` → people, `patterns` → shift_patterns. */
export function tableFor(segment: string, tables: string[]): string | null {
  const snake = segment.replace(/-/g, '_');
  return tables.find((t) => t === snake) ?? tables.find((t) => t.endsWith(`_${snake}`)) ?? null;
}
