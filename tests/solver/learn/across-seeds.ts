/**
 * The learner's check over several seeds (not a test: about a minute of solving). Prints τ per
 * seed, then the mean and the lowest, so a threshold in learn-weights.test.ts can be set from
 * what holds across seeds rather than on the test's seed. `npx tsx tests/solver/learn/across-seeds.ts [seeds]`.
 */
import { runCheck, summary } from './check';

async function main() {
  const seeds = (process.argv[2] ?? '0,1,2,3,4').split(',').map(Number);
  const taus: number[] = [];
  const held: string[] = [];
  for (const s of seeds) {
    const c = await runCheck(s);
    taus.push(c.tau);
    held.push(`${c.heldDisagreeBefore}→${c.heldDisagreeAfter}`);
    console.log(summary(c));
    if (process.env.VERBOSE) for (const k of c.moved) console.log(`  ${k.padEnd(20)} hidden ${c.hidden[k]}  current ${c.result.start[c.keys.indexOf(k)]}  learned ${c.result.weights[c.keys.indexOf(k)].toFixed(2)}`);
  }
  const mean = taus.reduce((m, x) => m + x, 0) / taus.length;
  console.log(`τ mean ${mean.toFixed(3)}, min ${Math.min(...taus).toFixed(3)}, max ${Math.max(...taus).toFixed(3)} over seeds ${seeds.join(', ')}; held-out disagreements ${held.join(', ')}`);
}

void main();
