import type { ReactNode } from 'react';
import type { CaseStatus } from '@/lib/enums';
import { caseStatusLabels } from '@/lib/cases/labels';

type Tone = 'neutral' | 'action' | 'warning' | 'failure' | 'success';

const tones: Record<Tone, string> = {
  neutral: 'border-line bg-paper-deep text-ink-soft',
  action: 'border-frost bg-frost-soft text-frost-dark',
  warning: 'border-amber bg-amber-soft text-amber',
  failure: 'border-rust bg-rust-soft text-rust',
  success: 'border-clover bg-clover-soft text-clover',
};

// A shape with every colour, so status never rests on colour alone.
const shapes: Record<Tone, string> = { neutral: '○', action: '◆', warning: '▲', failure: '✕', success: '✓' };

export function Badge({ tone, children }: { tone: Tone; children: ReactNode }) {
  return (
    <span className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-bold ${tones[tone]}`}>
      <span aria-hidden="true">{shapes[tone]}</span>
      {children}
    </span>
  );
}

export { caseStatusLabels };

const caseStatusTones: Record<CaseStatus, Tone> = {
  open: 'action',
  awaiting_sample: 'action',
  retest: 'action',
  review: 'warning',
  decided: 'success',
  withdrawn: 'neutral',
};

export function CaseStatusBadge({ status }: { status: CaseStatus }) {
  return <Badge tone={caseStatusTones[status]}>{caseStatusLabels[status]}</Badge>;
}

export const verdictLabels = { accepted: 'Accepted', deducted: 'Deducted', rejected: 'Rejected' } as const;

export function VerdictBadge({ verdict }: { verdict: keyof typeof verdictLabels }) {
  const tone: Tone = verdict === 'accepted' ? 'success' : verdict === 'deducted' ? 'warning' : 'failure';
  return <Badge tone={tone}>{verdictLabels[verdict]}</Badge>;
}
