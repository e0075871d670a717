import type { QueryClient } from '@tanstack/react-query';
import { keys } from './query-keys';

/**
 * An absence changes the coordinator's lists, the "needs cover" list and the person's own list,
 * so every absence write refreshes all three (through their query options' keys).
 */
export function invalidateAbsences(queryClient: QueryClient) {
  void queryClient.invalidateQueries({ queryKey: keys.absences.list._def });
  void queryClient.invalidateQueries({ queryKey: keys.absences.conflicts.queryKey });
  void queryClient.invalidateQueries({ queryKey: keys.me.absences.queryKey });
}
