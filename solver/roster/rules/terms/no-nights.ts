/** No nights (a per-person term, e.g. a health or caring arrangement): no night shift. Per night worked. Caution (shared/caution.ts): local law, agreements and the workplace's fatigue policy decide. */
import { shiftTerm } from './shift-level';

export const noNights = shiftTerm('noNights', 'This person works no night shifts.', (_t, f) => f.night, () => 'no nights');
