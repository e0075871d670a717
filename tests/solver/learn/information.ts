/**
 * How far 30 edits can pin the weights down, whatever the learner (a diagnosis, not a test; uses
 * the hidden weights, which the learner never sees). The learner's assumption is that the kept
 * roster beats every other filling of the seats the coordinator changed; those comparisons that
 * the hidden weights themselves keep (the others are dropped) cut out a set of weights that agree
 * with every edit (comparisons the hidden weights score as a tie are dropped too). Hit-and-run sampling (Smith 1984, "Efficient Monte Carlo procedures for
 * generating points uniformly distributed over bounded regions") draws from that set inside the
 * box 0..60, and τ-b is taken for each draw and for the draws' mean. A τ well below 0.8 here means
 * the edits do not carry the ranking. `npx tsx tests/solver/learn/information.ts [seeds]`.
 */
import { seededRandom } from '../../../shared/demo/make-roster';
import type { RosterAssignment } from '../../../shared/roster/schema';
import { makeFeaturizer } from '../../../solver/learn';
import { storedCheckEdits } from './check';
import { kendallTauB, type CoordinatorKind } from './helpers';

const BOX = 60;
/** Fillings of the changed seats enumerated per edit, at most (larger edits keep only kept vs proposed). */
const MAX_FILLINGS = 6000;

async function main() {
  const kinds = (process.argv[3] ?? 'single').split(',') as CoordinatorKind[];
  for (const kind of kinds) for (const seed of (process.argv[2] ?? '0,1,2,3,4').split(',').map(Number)) {
    const { rules, keys, hidden, train } = await storedCheckEdits(seed, kind);
    const hw = keys.map((k) => hidden[k]);
    const cons: { d: number[]; e: number }[] = [];
    const seen = new Set<string>();
    let broken = 0;
    const moved = new Array<number>(keys.length).fill(0);
    for (const t of train) {
      const r = t.roster;
      const f = makeFeaturizer(r, rules, keys);
      const kept = f(t.kept);
      const proposed = f(t.proposed);
      kept.rules.forEach((x, i) => (moved[i] += x !== proposed.rules[i] ? 1 : 0));
      const changed = r.seats.filter((s) => (t.kept[s.id] ?? null) !== (t.proposed[s.id] ?? null));
      const who = (skill: string | null) => [null, ...r.people.filter((p) => skill === null || p.skills.includes(skill)).map((p) => p.id)];
      const count = changed.reduce((m, seat) => m * who(seat.skill).length, 1);
      let fillings: RosterAssignment[] = [{ ...t.kept }];
      if (count <= MAX_FILLINGS) for (const seat of changed) fillings = fillings.flatMap((y) => who(seat.skill).map((p) => ({ ...y, [seat.id]: p })));
      else {
        fillings = [t.proposed];
        for (const seat of changed) for (const p of who(seat.skill)) if (p !== (t.kept[seat.id] ?? null)) fillings.push({ ...t.kept, [seat.id]: p });
        for (const [i, a] of changed.entries()) for (const b of changed.slice(i + 1)) fillings.push({ ...t.kept, [a.id]: t.kept[b.id] ?? null, [b.id]: t.kept[a.id] ?? null });
      }
      for (const y of fillings) {
        const fy = f(y);
        if (!fy.feasible) continue;
        const d = kept.rules.map((x, i) => x - fy.rules[i]);
        const e = kept.offset - fy.offset;
        // no constraint: the same comparison again, or one every w ≥ 0 keeps
        if (d.every((x) => x === 0) || (d.every((x) => x >= 0) && e >= 0)) continue;
        const key = `${d.join(',')}:${e}`;
        if (seen.has(key)) continue;
        seen.add(key);
        // a tie under the hidden weights is no preference (and a pair of opposite ties would hold
        // the draws at the hidden weights themselves)
        if (hw.reduce((m, w, i) => m + w * d[i], e) <= 1e-9) broken++;
        else cons.push({ d, e });
      }
    }
    const ranked = keys.map((_, i) => i).filter((i) => moved[i] >= 2);
    const rnd = seededRandom(5 + seed);
    const gauss = () => Math.sqrt(-2 * Math.log(rnd() + 1e-12)) * Math.cos(2 * Math.PI * rnd());
    let x = [...hw];
    const mean = new Array<number>(keys.length).fill(0);
    let tauSum = 0;
    let draws = 0;
    let stuck = 0; // directions with no room at all (the set is flat there)
    for (let it = 0; it < 20_000; it++) {
      const u = keys.map(gauss);
      let lo = -Infinity;
      let hi = Infinity;
      u.forEach((ui, i) => {
        if (ui > 0) [lo, hi] = [Math.max(lo, -x[i] / ui), Math.min(hi, (BOX - x[i]) / ui)];
        else if (ui < 0) [lo, hi] = [Math.max(lo, (BOX - x[i]) / ui), Math.min(hi, -x[i] / ui)];
      });
      for (const c of cons) {
        const a = c.d.reduce((m, v, i) => m + v * u[i], 0);
        const b = c.d.reduce((m, v, i) => m + v * x[i], c.e);
        if (a > 0) lo = Math.max(lo, -b / a);
        else if (a < 0) hi = Math.min(hi, -b / a);
      }
      if (hi - lo < 1e-9) stuck++;
      const step = lo + (hi - lo) * rnd();
      x = x.map((v, i) => v + step * u[i]);
      if (it >= 2000 && it % 10 === 0) {
        draws++;
        x.forEach((v, i) => (mean[i] += v));
        tauSum += kendallTauB(ranked.map((i) => x[i]), ranked.map((i) => hw[i]));
      }
    }
    const m = mean.map((v) => v / draws);
    console.log(JSON.stringify({ kind, seed, comparisons: cons.length, droppedByHidden: broken, stuckShare: +(stuck / 20_000).toFixed(2), tauOfDraws: +(tauSum / draws).toFixed(2), tauOfMean: +kendallTauB(ranked.map((i) => m[i]), ranked.map((i) => hw[i])).toFixed(2) }));
  }
}

void main();
