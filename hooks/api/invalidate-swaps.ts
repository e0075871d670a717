import type { QueryClient } from '@tanstack/react-query';

/** Everything a swap or offer changes: both sides' lists, the published roster and its shifts. */
export const invalidateSwaps = (queryClient: QueryClient) =>
  Promise.all([
    queryClient.invalidateQueries({ queryKey: ['me'] }),
    queryClient.invalidateQueries({ queryKey: ['swaps'] }),
    queryClient.invalidateQueries({ queryKey: ['offers'] }),
    queryClient.invalidateQueries({ queryKey: ['rosters'] }),
  ]);
