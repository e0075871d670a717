/**
 * Shown wherever working-time rules are set, broken or summarised. The defaults follow EU
 * Directive 2003/88/EC as a common baseline; the workplace's own rules decide.
 */
export const WORKING_TIME_CAUTION =
  'Rosters affect rest and fatigue. Rotaloom checks only the rules it is given (by default the EU Working Time Directive 2003/88/EC baseline: 11 h daily rest, 24 h weekly rest, 48 h average week, 8 h nights). Local law, collective agreements, licensed professional practice and your workplace’s fatigue policy decide what is allowed.';
