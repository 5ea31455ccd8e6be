// Demo data is dated relative to the day it is loaded, so a fresh checkout always has "recent" work.
export const DAY_MS = 86_400_000;

/** A clock for seeders: `at(3, 14)` is three days before `now`, at 14:00 UTC. */
export type DemoClock = (daysAgo: number, hour?: number) => Date;

export function demoClock(now = new Date()): DemoClock {
  return (daysAgo: number, hour = 9) => {
    const d = new Date(now.getTime() - daysAgo * DAY_MS);
    d.setUTCHours(hour, 0, 0, 0);
    return d;
  };
}
