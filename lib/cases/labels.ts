import type { CaseStatus } from '@/lib/enums';

export const caseStatusLabels: Record<CaseStatus, string> = {
  open: 'Opened',
  awaiting_sample: 'Sample in transit',
  retest: 'At the referee bench',
  review: 'Before the board',
  decided: 'Decided',
  withdrawn: 'Withdrawn',
};

export function caseStatusLabel(status: CaseStatus): string {
  return caseStatusLabels[status];
}
