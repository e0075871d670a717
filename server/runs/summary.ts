import type { RunOutcome } from './execute';
import { finite } from './execute';

/**
 * What a finished run keeps besides its assignments: the independent check (per-rule points and
 * the violations in words, capped so a disastrous roster cannot bloat the row) and per-person totals.
 */
export function summariseOutcome(outcome: RunOutcome) {
  const { check } = outcome;
  return {
    feasible: outcome.feasible,
    optimal: outcome.optimal,
    ideal: outcome.ideal,
    stopReason: outcome.stopReason,
    method: outcome.method,
    iterations: outcome.iterations,
    timeToBestMs: outcome.timeToBestMs,
    openSeats: outcome.openSeats,
    checkedScore: finite(check.total),
    terms: check.terms,
    hardCounts: check.hardCounts,
    violations: check.violations
      .slice()
      .sort((a, b) => a.points - b.points)
      .slice(0, 500)
      .map((v) => ({ ...v, points: finite(v.points) })),
    violationCount: check.violations.length,
    people: outcome.people,
  };
}
