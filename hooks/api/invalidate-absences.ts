import type { QueryClient } from '@tanstack/react-query';
import { absencesQueryOptions } from './get-absences';
import { absenceConflictsQueryOptions } from './get-absence-conflicts';
import { myAbsencesQueryOptions } from './get-my-absences';

/**
 * An absence changes the coordinator's lists, the "needs cover" list and the person's own list,
 * so every absence write refreshes all three (through their query options' keys).
 */
export function invalidateAbsences(queryClient: QueryClient) {
  void queryClient.invalidateQueries({ queryKey: absencesQueryOptions().queryKey.slice(0, 2) });
  void queryClient.invalidateQueries({ queryKey: absenceConflictsQueryOptions().queryKey });
  void queryClient.invalidateQueries({ queryKey: myAbsencesQueryOptions().queryKey });
}
