/** Time helpers of the weekly rest rule. */
export { dayStartMs, formatHours, rollingWindows } from '../../../shared/roster/derive';
