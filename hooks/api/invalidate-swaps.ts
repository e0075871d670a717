import type { QueryClient } from '@tanstack/react-query';
import { keys } from './query-keys';

/** Everything a swap or offer changes: both sides' lists, the published roster and its shifts. */
export const invalidateSwaps = (queryClient: QueryClient) =>
  Promise.all([
    queryClient.invalidateQueries({ queryKey: keys.me._def }),
    queryClient.invalidateQueries({ queryKey: keys.swaps._def }),
    queryClient.invalidateQueries({ queryKey: keys.offers._def }),
    queryClient.invalidateQueries({ queryKey: keys.rosters._def }),
  ]);
