import { useEffect, useState } from 'react';

/** The value once it has stayed the same for `ms`: a search box asks the server once per pause, not per key. */
export function useDebounced<T>(value: T, ms: number): T {
  const [debounced, setDebounced] = useState(value);
  useEffect(() => {
    const t = setTimeout(() => setDebounced(value), ms);
    return () => clearTimeout(t);
  }, [value, ms]);
  return debounced;
}
