import { formatDateTime } from '@/lib/format/dates';

/** The parts of a calibration check that decide whether an instrument may be used. */
export type CheckSummary = { id: string; checkedAt: Date; pass: boolean; within: number; total: number; validUntil: Date };

export type InstrumentStatus =
  | { state: 'fit'; until: Date; check: CheckSummary; label: string }
  | { state: 'unfit'; reason: 'never_checked' | 'failed' | 'expired' | 'retired'; check: CheckSummary | null; label: string };

/**
 * Whether an instrument is fit for work at a moment, from its latest check at or before that moment.
 * A failed check makes it unfit at once, even while an earlier pass has not yet run out: the instrument
 * must be recalibrated and pass again.
 */
export function instrumentStatusAt(latest: CheckSummary | null, at: Date, options: { active?: boolean } = {}): InstrumentStatus {
  if (options.active === false) return { state: 'unfit', reason: 'retired', check: latest, label: 'Unfit: taken out of service' };
  if (!latest || latest.checkedAt.getTime() > at.getTime()) {
    return { state: 'unfit', reason: 'never_checked', check: null, label: 'Unfit: no calibration check recorded' };
  }
  if (!latest.pass) {
    return {
      state: 'unfit',
      reason: 'failed',
      check: latest,
      label: `Unfit: the check of ${formatDateTime(latest.checkedAt)} failed (${latest.within} of ${latest.total} within tolerance); recalibrate and check again`,
    };
  }
  if (at.getTime() > latest.validUntil.getTime()) {
    return { state: 'unfit', reason: 'expired', check: latest, label: `Unfit: the last passing check ran out on ${formatDateTime(latest.validUntil)}; run a check` };
  }
  return { state: 'fit', until: latest.validUntil, check: latest, label: `Fit for work until ${formatDateTime(latest.validUntil)}` };
}
