'use client';

import { intakeVerdict } from '@/lib/intake/verdict';
import type { SchemeRules } from '@/lib/rules/schema';
import { formatMoney } from '@/lib/money/minor-units';
import { VerdictBadge } from '@/components/ui/status';

// Limits as the scheme states them, three decimals; the result and the acceptance limit to the 0.0001 °C they are compared at.
const c3 = (v: number) => `${v.toFixed(3).replace('-', '−')} °C`;
const c = (v: number) => `${v.toFixed(4).replace('-', '−')} °C`;

/** The verdict the scheme's rules give the readings so far; the server works it out again on submit. */
export function VerdictPreview({ value, used, volumeLitres, rules, version }: { value: number | null; used: number; volumeLitres: number | null; rules: SchemeRules; version: number }) {
  if (value === null || volumeLitres === null || !(volumeLitres > 0)) {
    return <p className="text-sm text-brine">The verdict appears here once the readings give a final result and the volume is entered.</p>;
  }
  const v = intakeVerdict({ value, readingsUsed: used, volumeLitres, rules });
  return (
    <div data-testid="verdict-preview" className="grid gap-1 text-sm">
      <p className="flex flex-wrap items-center gap-2">
        <VerdictBadge verdict={v.verdict} />
        <span>
          {c(value)} against the {v.limitApplied === 'lower' ? 'lower' : 'upper'} limit {c3(v.limit)}, acceptance limit {c(v.acceptanceLimit)} ({rules.decisionRule.replaceAll('_', ' ')}), rules v{version}.
        </span>
      </p>
      <p>
        Added water {v.addedWaterPercent.toFixed(2)} % against the reference {c3(rules.referenceFreezingPoint)}.{' '}
        {v.verdict === 'accepted' ? 'Nothing withheld.' : `Withheld ${formatMoney(v.amountMinor, rules.currency)} (${v.arithmetic}).`}
      </p>
    </div>
  );
}
