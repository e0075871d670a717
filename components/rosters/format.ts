import { format } from 'date-fns';

/** Points as people read them: one decimal below 10, whole numbers above. */
export const points = (x: number | null | undefined): string => {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—';
  const a = Math.abs(x);
  const s = a < 10 ? a.toFixed(1) : Math.round(a).toLocaleString('en-GB');
  return `${x < 0 ? '−' : ''}${s}`;
};

/**
 * The solver's gap in words. gap = (bound − score) / max(1, |score|) (solver/inference/solve.ts):
 * the best possible roster scores at most `bound`, so this one is at most that far from it.
 * With the run's `ideal` (every rule, wish and pairing at its own best) the words count
 * concessions instead: this roster gives up ideal − score points, no roster fewer than
 * ideal − bound, so at most (bound − score) / (ideal − score) of what it gives up is avoidable.
 */
export function gapWords(score: number | null, bound: number | null, gap: number | null, optimal?: boolean, ideal?: number | null): string {
  if (score === null) return 'No roster that keeps every hard rule has been found yet.';
  const hasIdeal = ideal !== null && ideal !== undefined && Number.isFinite(ideal);
  if (optimal || (gap !== null && gap <= 1e-9))
    return hasIdeal
      ? `Proven the best possible roster for these rules and wishes: it gives up ${points(ideal - score)} points, and no roster can give up fewer.`
      : 'Proven the best possible roster for these rules and wishes.';
  if (bound === null || gap === null) return 'Score found; no bound on the best possible roster yet.';
  if (hasIdeal) {
    const given = ideal - score;
    const least = Math.max(0, ideal - bound);
    const share = given > 0 ? (bound - score) / given : 0;
    const pct = share * 100;
    const text = pct < 0.1 ? 'less than 0.1%' : pct < 10 ? `${pct.toFixed(1)}%` : `${Math.round(Math.min(100, pct))}%`;
    return `This roster gives up ${points(given)} points; no roster can give up fewer than ${points(least)}. At most ${text} of what it gives up could still be avoided.`;
  }
  // A percentage of a score near zero says little ("at most 346%"), so past 100% the distance is in points.
  if (gap >= 1) return `At most ${points(bound - score)} points below the best possible roster (the best possible scores at most ${points(bound)} points).`;
  const pct = gap * 100;
  const text = pct < 0.1 ? 'less than 0.1%' : pct < 10 ? `${pct.toFixed(1)}%` : `${Math.round(pct)}%`;
  return `At most ${text} from the best possible roster (the best possible scores at most ${points(bound)} points).`;
}

const localDate = (s: string) => new Date(Number(s.slice(0, 4)), Number(s.slice(5, 7)) - 1, Number(s.slice(8, 10)), 12);

/** "Mon 4 Jan" for a YYYY-MM-DD (or the date part of a local date-time). */
export const dayWords = (s: string) => format(localDate(s.slice(0, 10)), 'EEE d MMM');
export const longDayWords = (s: string) => format(localDate(s.slice(0, 10)), 'EEEE d MMMM yyyy');
export const timeOf = (local: string) => local.slice(11, 16);
export const periodWords = (start: string, end: string) => `${dayWords(start)} – ${dayWords(end)} ${end.slice(0, 4)}`;

/** A run as people name it: its number within the roster. */
export const runName = (r: { id: number; number?: number }) => `Run ${r.number ?? r.id}`;

/** Roster JSON ids (p12, st99) back to database ids. */
export const dbId = (prefixed: string) => Number(prefixed.replace(/^[a-z]+/, ''));
