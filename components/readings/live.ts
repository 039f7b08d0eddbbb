import { criticalRangeOfFour, finalResult, type FinalResult, type Precision } from '@/lib/arbitration';

/**
 * The readings typed so far, in order, up to the first one that is empty or not a freezing point:
 * the live helper judges only what has actually been entered.
 */
export function typedReadings(values: readonly unknown[]): number[] {
  const out: number[] = [];
  for (const v of values) {
    const text = typeof v === 'number' ? String(v) : String(v ?? '').trim().replace(/[\u2212\u2013]/g, '-').replace(',', '.');
    const n = Number(text);
    if (text === '' || !Number.isFinite(n) || n < -1 || n > 0) break;
    out.push(n);
  }
  return out;
}

const milli = (celsius: number) => `${(celsius * 1000).toFixed(1)} m°C`;
const celsius = (value: number) => `${value.toFixed(4).replace('-', '−')} °C`;

export type LiveReadings =
  | { state: 'empty'; message: string }
  | { state: 'more'; needed: number; message: string }
  | { state: 'accepted'; result: Extract<FinalResult, { status: 'accepted' }>; spare: number; message: string };

/** What the decision module says of the readings so far, in words for the analyst at the bench. */
export function describeReadings(values: readonly number[], precision: Precision): LiveReadings {
  if (values.length === 0) {
    return { state: 'empty', message: `Two readings that agree within r = ${milli(precision.r)} give the result; otherwise two more are needed.` };
  }
  const result = finalResult(values, precision);
  if (result.status === 'needs_more_readings') {
    const why =
      values.length >= 2
        ? `: the first two differ by ${milli(Math.abs(values[0] - values[1]))}, more than r = ${milli(precision.r)}`
        : '';
    return { state: 'more', needed: result.needed, message: `${result.needed} more reading${result.needed === 1 ? '' : 's'} needed${why}.` };
  }
  const spare = values.length - result.used;
  const basis =
    result.basis === 'mean_of_2'
      ? 'mean of the first two readings'
      : result.basis === 'mean_of_4'
        ? `mean of four readings (their range is within the critical range ${milli(criticalRangeOfFour(precision))})`
        : `median of four readings (their range exceeds the critical range ${milli(criticalRangeOfFour(precision))})`;
  return {
    state: 'accepted',
    result,
    spare,
    message: `Final result ${celsius(result.value)}: ${basis}${spare > 0 ? `; ${spare} further reading${spare === 1 ? ' is' : 's are'} not used` : ''}.`,
  };
}
