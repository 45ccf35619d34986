import { useEffect, useState } from 'react';

/** The time, refreshed every `everyMs`: for "overdue", "3 min ago" and clocks without impure renders. */
export function useNow(everyMs = 30_000): number {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    const t = setInterval(() => setNow(Date.now()), everyMs);
    return () => clearInterval(t);
  }, [everyMs]);
  return now;
}
