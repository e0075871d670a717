/**
 * Benchmark: `npm run bench:solver [-- --quick] [--only SUBSTRING] [--no-roster-cases] [--wall]`.
 * Time limits and times are CPU time of the process unless --wall is given.
 * Generates the model families (Potts grids, frustrated cycles, random binary
 * graphs, roster-like seat models at 10 / 60 / 200 people), then the roster cases
 * from ./roster-cases when that file exists, solves each with its time limit and
 * prints one markdown table row per instance: variables, factors, time to best,
 * total time, score, bound, gap, and a reference optimum where one was computed
 * (enumeration or javascript-lp-solver ILP), plus peak memory.
 */
import { existsSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Model } from '../model/types';
import { relativeGap, solveMap, type MapResult } from '../inference/solve';
import { enumerateModel } from '../inference/exact';
import { frustratedCycle, pottsGrid, randomBinaryGraph, rosterModel, countPairwise } from './families';
import { ilpOptimum } from './ilp';
import { highsOptimum } from './highs-mip';

interface Case {
  name: string;
  build: () => Model;
  timeLimitMs: number;
  reference?: 'enumerate' | 'ilp' | 'highs';
  /** HiGHS time limits (s) for the MIP and its LP relaxation (reference 'highs'). */
  highs?: { mipS: number; lpS: number };
  /** Roster cases: solve through the roster path (solveRoster's bound and search) instead of solveMap. */
  solve?: (opts: { timeLimitMs: number; seed: number; clock: () => number }) => Promise<MapResult>;
  target?: string;
  /** Roster cases: a score the issue wants reached early; the note says when it was (from the history). */
  scoreTarget?: number;
  /** Extra check after solving (roster cases: independent roster score). */
  check?: (r: MapResult) => string;
  /** Roster cases: concessions against the ideal, in words. */
  concessions?: (r: MapResult) => string;
}

const args = process.argv.slice(2);
const quick = args.includes('--quick');
const only = args.includes('--only') ? args[args.indexOf('--only') + 1] : undefined;
const skipRosterCases = args.includes('--no-roster-cases');
// --no-highs skips the HiGHS reference of the roster rows (it takes minutes)
const skipHighs = args.includes('--no-highs');
// Budgets and times are CPU time of this process by default ("on one core" on a shared machine);
// --wall uses the wall clock instead.
const wall = args.includes('--wall');
const cpuMs = (): number => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
};
const clock = wall ? Date.now : cpuMs;

const cases: Case[] = [
  { name: 'potts-grid 10×10, K=3', build: () => pottsGrid({ w: 10, h: 10, k: 3, seed: 1 }), timeLimitMs: 2_000, reference: 'ilp' },
  { name: 'potts-grid 30×30, K=5', build: () => pottsGrid({ w: 30, h: 30, k: 5, seed: 2 }), timeLimitMs: 5_000 },
  { name: 'frustrated cycle n=16', build: () => frustratedCycle({ n: 16, seed: 3 }), timeLimitMs: 2_000, reference: 'enumerate' },
  { name: 'frustrated cycle n=200', build: () => frustratedCycle({ n: 200, seed: 4 }), timeLimitMs: 2_000, reference: 'ilp' },
  { name: 'random binary graph n=30, deg 3', build: () => randomBinaryGraph({ n: 30, degree: 3, seed: 5 }), timeLimitMs: 2_000, reference: 'ilp' },
  { name: 'random binary graph n=200, deg 4', build: () => randomBinaryGraph({ n: 200, degree: 4, seed: 6 }), timeLimitMs: 5_000 },
  { name: 'roster-like 10 people, 42 seats', build: () => rosterModel({ people: 10, days: 7, shiftsPerDay: 3, seatsPerShift: 2, seed: 7 }), timeLimitMs: 2_000 },
  {
    name: 'roster-like 60 people, 252 seats × 61 values',
    build: () => rosterModel({ people: 60, days: 21, shiftsPerDay: 3, seatsPerShift: 4, seed: 8 }),
    timeLimitMs: 2_000,
    target: 'gap ≤ 0.5 % in < 2 s',
  },
  {
    name: 'roster-like 200 people, 2016 seats × 201 values',
    build: () => rosterModel({ people: 200, days: 28, shiftsPerDay: 3, seatsPerShift: 24, dayAllDifferent: true, weeklyCap: 5, seed: 9 }),
    timeLimitMs: 15_000,
    target: 'feasible, gap < 2 % in < 15 s, < 1 GB',
  },
];

interface RosterBenchCaseLike {
  name: string;
  timeLimitMs: number;
  target?: { maxGap: number; withinMs: number };
  scoreTarget?: number;
  highs?: { mipS: number; lpS: number };
  build(): {
    model: Model;
    initial?: ArrayLike<number>;
    solve?: (opts: { timeLimitMs: number; seed: number; clock: () => number }) => Promise<MapResult>;
    check?(assignment: ArrayLike<number>): { score: number; feasible: boolean; openSeats?: number };
    concessions?(r: MapResult): string;
  };
}

const fmt = (v: number, d = 3): string => (v === -Infinity ? '−∞' : v === Infinity ? '∞' : Number.isFinite(v) ? v.toFixed(d) : String(v));
const pct = (g: number): string => (Number.isFinite(g) ? `${(g * 100).toFixed(3)} %` : '∞');

async function run(): Promise<void> {
  const here = dirname(fileURLToPath(import.meta.url));
  const all: Array<Case & { lazy?: () => { model: Model; check?: (a: ArrayLike<number>) => string } }> = [...cases];
  for (const ext of skipRosterCases ? [] : ['roster-cases.ts', 'roster-cases.js']) {
    if (!existsSync(join(here, ext))) continue;
    const mod = (await import('./roster-cases')) as { rosterBenchCases?: () => RosterBenchCaseLike[] };
    for (const rc of mod.rosterBenchCases?.() ?? []) {
      let built: ReturnType<RosterBenchCaseLike['build']> | null = null;
      const get = () => (built ??= rc.build());
      all.push({
        name: rc.name,
        timeLimitMs: quick ? Math.min(rc.timeLimitMs, 3_000) : rc.timeLimitMs,
        target: rc.target ? `gap ≤ ${rc.target.maxGap * 100} % in < ${rc.target.withinMs / 1000} s` : undefined,
        build: () => get().model,
        reference: rc.highs && !skipHighs ? 'highs' : undefined,
        scoreTarget: rc.scoreTarget,
        highs: rc.highs,
        solve: (o) => get().solve?.(o) ?? solveMap(get().model, { timeLimitMs: o.timeLimitMs, seed: o.seed, clock: o.clock, initial: get().initial }),
        concessions: (r) => get().concessions?.(r) ?? '',
        check: (r) => {
          const c = get().check?.(r.assignment);
          if (!c) return '';
          const agree = Math.abs(c.score - r.score) <= 1e-6 * Math.max(1, Math.abs(r.score)) || c.score === r.score;
          return `roster score ${fmt(c.score)} (${agree ? 'agrees' : 'DISAGREES'})`;
        },
      });
    }
    break;
  }
  const rows: string[] = [];
  const head = `| instance | vars | factors (pairwise) | max K | time to best (${wall ? 'wall' : 'CPU'}) | time (${wall ? 'wall' : 'CPU'}) | wall | score | bound | gap | gap ≤ 2 % / 0.5 % at | reference | peak RSS | notes |`;
  rows.push(head, '|' + head.split('|').slice(1, -1).map(() => ' --- ').join('|') + '|');
  console.log(rows.join('\n'));
  for (const c of all) {
    if (only && !c.name.includes(only)) continue;
    // roster cases compile inside their solve (it counts against the limit); the rest are built first
    const tb = Date.now();
    const pre = c.solve ? null : c.build();
    const buildMs = Date.now() - tb;
    const limit = quick ? Math.min(c.timeLimitMs, 2_000) : c.timeLimitMs;
    const w0 = Date.now();
    const r = c.solve ? await c.solve({ timeLimitMs: limit, seed: 1, clock }) : await solveMap(pre!, { timeLimitMs: limit, seed: 1, clock });
    const wallMs = Date.now() - w0;
    const rss = `${Math.round(process.resourceUsage().maxRSS / 1024)} MB`;
    const model = pre ?? c.build();
    const n = model.variables.length;
    const maxK = Math.max(...model.variables.map((v) => v.cardinality));
    let ref = '—';
    if (c.reference === 'enumerate') ref = `${fmt(enumerateModel(model).score)} (enumeration)`;
    if (c.reference === 'ilp' && !quick) {
      const t = Date.now();
      const il = ilpOptimum(model, 60_000);
      ref = `${fmt(il.score)} (ILP, javascript-lp-solver, ${((Date.now() - t) / 1000).toFixed(1)} s)`;
    }
    if (c.reference === 'highs' && c.highs && !quick) {
      // HiGHS (npm highs) on the MIP of highs-mip.ts, started from our roster; then its LP relaxation
      const attempt = async <T,>(f: () => Promise<T>): Promise<T | string> => {
        try {
          return await f();
        } catch (e) {
          return `failed: ${(e as Error).message}`;
        }
      };
      const mip = await attempt(() => highsOptimum(model, { timeLimitS: c.highs!.mipS, start: r.assignment }));
      const lp = await attempt(() => highsOptimum(model, { relax: true, timeLimitS: c.highs!.lpS }));
      const mipText =
        typeof mip === 'string'
          ? `MIP ${mip}`
          : mip.status === 'optimal'
            ? `MIP optimum ${fmt(mip.score)} in ${(mip.timeMs / 1000).toFixed(0)} s`
            : `MIP best ${fmt(mip.score)}, its bound ${fmt(mip.bound)} (${mip.status}) in ${(mip.timeMs / 1000).toFixed(0)} s`;
      const lpText =
        typeof lp === 'string' ? `LP ${lp}` : lp.status === 'optimal' ? `LP ${fmt(lp.bound)} in ${(lp.timeMs / 1000).toFixed(0)} s` : `LP not solved (${lp.status}) in ${(lp.timeMs / 1000).toFixed(0)} s`;
      ref = `${mipText}; ${lpText} (HiGHS)`;
    }
    const proven = r.optimal ? r.history.find((p) => p.score > -Infinity && p.bound <= p.score + 1e-9) : undefined;
    const reached = c.scoreTarget !== undefined ? r.history.find((p) => p.score >= c.scoreTarget! - 1e-9) : undefined;
    const scoreNote = c.scoreTarget === undefined ? '' : `score ≥ ${c.scoreTarget} ${reached ? `at ${(reached.timeMs / 1000).toFixed(2)} s` : 'not reached'}`;
    const notes = [`${r.method}`, r.optimal ? `proven best${proven ? ` at ${(proven.timeMs / 1000).toFixed(2)} s` : ''}` : r.stopReason, scoreNote, c.concessions ? c.concessions(r) : '', c.target ? `target: ${c.target}` : '', buildMs > 50 ? `build ${buildMs} ms` : '', c.check ? c.check(r) : '']
      .filter(Boolean)
      .join('; ');
    // first moment the certified gap reached 2 % and 0.5 % (from the run's history)
    const reach = (g: number): string => {
      const h = r.history.find((p) => p.score > -Infinity && relativeGap(p.score, p.bound) <= g);
      return h ? `${(h.timeMs / 1000).toFixed(2)} s` : '—';
    };
    const row = `| ${c.name} | ${n} | ${model.factors.length} (${countPairwise(model)}) | ${maxK} | ${(r.timeToBestMs / 1000).toFixed(2)} s | ${(r.timeMs / 1000).toFixed(2)} s | ${(wallMs / 1000).toFixed(1)} s | ${fmt(r.score)} | ${fmt(r.bound)} | ${pct(r.gap)} | ${reach(0.02)} / ${reach(0.005)} | ${ref} | ${rss} | ${notes} |`;
    console.log(row);
  }
  console.log('\npeak RSS is the process maximum so far (cumulative over the rows above).');
}

run().catch((e: unknown) => {
  console.error(`bench failed: ${(e as Error).stack ?? e}`);
  process.exitCode = 1;
});
