/**
 * The roster's MIP as a CPLEX LP file, for HiGHS, CBC, GLPK or any solver that reads the format:
 * an audit any outside solver can check. The encoding is the one in solver/bench/highs-mip.ts
 * (kept there, in one place, so the HiGHS reference and this file can never disagree); the
 * header says how to read the answer back: objective + constant = roster score, and column
 * x<i>_<v> = 1 puts value v (see the seat's labels) on seat i.
 */
import { encodeMip } from '../bench/highs-mip';
import type { CompiledRoster } from './compile';

export function rosterLp(compiled: CompiledRoster): { text: string; columns: number; rows: number; constant: number } {
  const enc = encodeMip(compiled.model);
  const seats = compiled.seatIds.length;
  const header = [
    `\\ Rotaloom roster MIP: ${compiled.roster.name ?? 'roster'}`,
    `\\ roster score = objective + ${enc.constant}`,
    `\\ x<i>_<v> = 1: seat i (0..${seats - 1}, roster order) takes value v (person index in its domain; the last value may be "open")`,
  ];
  return { text: `${header.join('\n')}\n${enc.lp}\n`, columns: enc.columns, rows: enc.rows, constant: enc.constant };
}
