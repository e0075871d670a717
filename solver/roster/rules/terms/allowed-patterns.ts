/** Only these shifts (a per-person term): only shifts whose pattern label is listed. Per shift outside. */
import { shiftTerm } from './shift-level';

export const allowedPatterns = shiftTerm('allowedPatterns', 'This person works only some kinds of shift.', (t, f) => !t.labels.includes(f.patternLabel), (t) => `${t.labels.join(', ')} only`);
