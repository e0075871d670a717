import { Notice } from '@/components/ui/notice';
import { offlineLine } from './offline-line';

/** Said above shifts that came from the phone's saved copy rather than from Rotaloom just now. */
export function OfflineNotice({ savedAt, timeZone }: { savedAt: string; timeZone: string }) {
  return <Notice kind="caution">{offlineLine(savedAt, timeZone)}</Notice>;
}
