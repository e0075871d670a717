/**
 * "Did you mean" for a CSV's unknown skill names, with its work bounded: a 200 KB skills column
 * once held the whole server for 1.9 s comparing every cell against every skill. Each file gets
 * SUGGESTION_LIMITS.perFile suggestions; names longer than any skill name get none; and a
 * comparison stops as soon as the names are further apart than a suggestion may be.
 */
export const SUGGESTION_LIMITS = { perFile: 50, maxNameLength: 80 } as const;

const budgets = new WeakMap<object, { left: number }>();

/** Edit distance of a and b if it is at most `limit`, else limit + 1 (banded Levenshtein). */
export function boundedDistance(a: string, b: string, limit: number): number {
  if (Math.abs(a.length - b.length) > limit) return limit + 1;
  let prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const row = [i];
    let best = i;
    for (let j = 1; j <= b.length; j++) {
      row[j] = Math.min(prev[j] + 1, row[j - 1] + 1, prev[j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1));
      if (row[j] < best) best = row[j];
    }
    if (best > limit) return limit + 1;
    prev = row;
  }
  return Math.min(prev[b.length], limit + 1);
}

/**
 * The known name nearest to `wanted` (keys already normalised) within max(2, length / 4) edits,
 * or null; `file` is any object that lives as long as one file's check (the file's skill map).
 */
export function nearestName<T extends { name: string }>(wanted: string, known: Map<string, T>, file: object): T | null {
  if (wanted.length > SUGGESTION_LIMITS.maxNameLength) return null;
  const budget = budgets.get(file) ?? { left: SUGGESTION_LIMITS.perFile };
  budgets.set(file, budget);
  if (budget.left <= 0) return null;
  budget.left--;
  const limit = Math.max(2, Math.floor(wanted.length / 4));
  let best: { item: T; d: number } | null = null;
  for (const [key, item] of known) {
    const d = boundedDistance(wanted, key, best ? best.d - 1 : limit);
    if (d <= (best ? best.d - 1 : limit)) best = { item, d };
  }
  return best?.item ?? null;
}
