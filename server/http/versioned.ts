import type { Model, ModelStatic, WhereOptions } from 'sequelize';
import { HttpError } from './errors';

/**
 * Optimistic locking: the update applies only if the row still has the version the client last
 * saw, and bumps it. A stale write is a 409 that says so, and changes nothing.
 */
export async function updateVersioned<M extends Model>(
  model: ModelStatic<M>,
  where: WhereOptions,
  version: number,
  changes: Record<string, unknown>,
  what: string,
): Promise<void> {
  const current = await model.findOne({ where });
  if (!current) throw new HttpError(404, 'not_found', `${what} not found`);
  const [count] = await model.update({ ...changes, version: version + 1 } as never, { where: { ...(where as object), version } as WhereOptions });
  if (count === 0) {
    throw new HttpError(409, 'conflict', `Someone else changed this ${what.toLowerCase()} while you were editing it. Reload to see their changes; yours are still on your screen.`, [
      { path: 'body.version', message: `you edited version ${version}; the current one is ${(current.get('version') as number) ?? '?'}` },
    ]);
  }
}
