/**
 * When the outbox hands its queued notices over. Requests come first: delivery starts once commits
 * have paused for QUIET_MS, so a burst of changes is not slowed by rendering its own mail, and one
 * batch then carries the whole burst's notices. It never waits more than LONGEST_WAIT_MS after the
 * first commit it was woken for, so a steady stream of changes still sends its mail within seconds.
 */
export const QUIET_MS = 200;
export const LONGEST_WAIT_MS = 10_000;

/** How much longer to wait before delivering, in ms; 0 means deliver now. */
export function deliveryWait(now: number, wokenAt: number, lastCommitAt: number): number {
  const untilQuiet = lastCommitAt + QUIET_MS - now;
  const untilLongest = wokenAt + LONGEST_WAIT_MS - now;
  return Math.max(0, Math.min(untilQuiet, untilLongest));
}
