/**
 * The learner's check over several seeds and coordinator kinds (not a test: minutes of solving).
 * Prints τ per seed, then the mean and the lowest per kind, so a threshold in learn-weights.test.ts
 * can be set from what holds across seeds rather than on the test's seed.
 * `npx tsx tests/solver/learn/across-seeds.ts [seeds] [kinds] [learner options as JSON, several
 * separated by ;]`, e.g. `… 0,1,2,3,4 single,day '{"priorStrength":0.1};{}'` (each seed's edits are
 * made once and given to every learner). ONLINE=1: the training rosters are proposed under the
 * weights the learner suggests as the edits come in (checkEdits' `online`), so each learner makes its own edits.
 */
import { checkEdits, storedCheckEdits, runCheck, summary, type CheckEdits } from './check';
import type { CoordinatorKind } from './helpers';

async function main() {
  const seeds = (process.argv[2] ?? '0,1,2,3,4').split(',').map(Number);
  const kinds = (process.argv[3] ?? 'single').split(',') as CoordinatorKind[];
  const learners = (process.argv[4] ?? '{}').split(';').map((x) => JSON.parse(x));
  const made = new Map<string, CheckEdits>();
  for (const kind of kinds) for (const learn of learners) {
    const taus: number[] = [];
    const held: string[] = [];
    for (const s of seeds) {
      const online = process.env.ONLINE ? learn : undefined;
      const key = `${kind}:${s}:${online ? JSON.stringify(learn) : ''}`;
      // EDITS_DIR=dir keeps each seed's edits in a file there, for later runs
      if (!made.has(key)) made.set(key, online ? await checkEdits(s, kind, online) : await storedCheckEdits(s, kind));
      const c = await runCheck(s, learn, kind, made.get(key));
      taus.push(c.tau);
      held.push(`${c.heldDisagreeBefore}→${c.heldDisagreeAfter}`);
      console.log(summary(c));
      if (process.env.VERBOSE) for (const k of c.moved) console.log(`  ${k.padEnd(20)} hidden ${c.hidden[k]}  current ${c.result.start[c.keys.indexOf(k)]}  learned ${c.result.weights[c.keys.indexOf(k)].toFixed(2)}`);
    }
    const mean = taus.reduce((m, x) => m + x, 0) / taus.length;
    console.log(`${kind}: τ ${taus.map((t) => t.toFixed(2)).join(', ')}; mean ${mean.toFixed(3)}, min ${Math.min(...taus).toFixed(3)} over seeds ${seeds.join(', ')}; held-out disagreements ${held.join(', ')}; learner ${JSON.stringify(learn)}${process.env.ONLINE ? ', proposals under its suggestions' : ''}`);
  }
}

void main();
