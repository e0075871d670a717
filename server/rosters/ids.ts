/**
 * Database ids ↔ the string ids of the roster JSON format (shared/roster). Prefixes keep a
 * person id from ever being mistaken for a seat id in a file or a log.
 */
export const rosterIds = {
  person: (id: number) => `p${id}`,
  skill: (id: number) => `s${id}`,
  shift: (id: number) => `sh${id}`,
  seat: (id: number) => `st${id}`,
};

export function parseRosterId(kind: 'p' | 's' | 'sh' | 'st', value: string): number {
  const m = new RegExp(`^${kind}(\\d+)$`).exec(value);
  if (!m) throw new Error(`not a ${kind} id: ${value}`);
  return Number(m[1]);
}
