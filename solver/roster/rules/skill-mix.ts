/** Skill mix (common practice, no source): at least `min` people with `skill` on each shift (of `patternLabel`). Per person short. */
import { describeShift } from '../../../shared/roster/derive';
import { defineRule } from './types';

export const skillMix = defineRule({
  id: 'skillMix',
  explain: 'Each shift needs enough people with a skill (a first-aider on every shift), whoever sits in which seat.',
  compile(ctx, r) {
    r.requirements.forEach((q, qi) => {
      for (const f of ctx.facts) {
        if (q.patternLabel !== undefined && f.patternLabel !== q.patternLabel) continue;
        const short = (k: number) => (k < q.min ? (r.hard ? -Infinity : -r.weight * (q.min - k)) : 0);
        const vars: number[] = [];
        const weights: [number, number][][] = [];
        for (const s of ctx.seatsOfShift[f.index]) {
          const ws: [number, number][] = [];
          ctx.domains[s].forEach((p, x) => {
            if (p !== -1 && ctx.roster.people[p].skills.includes(q.skill)) ws.push([x, 1]);
          });
          if (ws.length) {
            vars.push(s);
            weights.push(ws);
          }
        }
        if (!vars.length) {
          ctx.termConstants.skillMix += short(0);
          continue;
        }
        const table = new Float64Array(Math.min(vars.length, q.min) + 1);
        for (let k = 0; k < table.length; k++) table[k] = short(k);
        ctx.factors.push({ kind: 'counting', vars, weights, score: table, hard: r.hard || undefined, id: `skillMix:${qi}:${f.id}`, label: `${q.min} with ${q.skill} on ${describeShift(f)}` });
      }
    });
  },
  check(ctx, r) {
    for (const q of r.requirements)
      ctx.facts.forEach((f, i) => {
        if (q.patternLabel !== undefined && f.patternLabel !== q.patternLabel) return;
        const have = ctx.seatsOfShift[i].filter((s) => ctx.holder[s] >= 0 && ctx.roster.people[ctx.holder[s]].skills.includes(q.skill)).length;
        if (have < q.min) ctx.breach('skillMix', r.hard, r.weight, q.min - have, `${describeShift(f)} has ${have} with ${ctx.skillName(q.skill)}; at least ${q.min}`, [], ctx.seatsOfShift[i]);
      });
  },
});
