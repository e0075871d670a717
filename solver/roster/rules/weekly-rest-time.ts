/** Time helpers of the weekly rest rule. */
import { format } from 'date-fns';
import { TZDate } from '@date-fns/tz';
export { dayStartMs, formatHours, rollingWindows } from '../../../shared/roster/derive';

/** "Mon 4 Jan 15:00" for an instant in the roster's time zone. */
export function instantLabel(ms: number, tz: string): string {
  return format(new TZDate(ms, tz), 'EEE d MMM HH:mm');
}
