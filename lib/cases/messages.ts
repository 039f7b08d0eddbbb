import type { TransitionName } from './lifecycle';

/** What the case file says after each transition succeeded. */
export const successMessages: Record<TransitionName, string> = {
  dispatch: 'The sample is recorded as dispatched; the laboratory has been told.',
  receive: 'Receipt recorded. The sample is at your bench.',
  submit_retest: 'Retest submitted. The board has been told; the intake result is now visible to you.',
  order_further_test: 'Further test ordered; the laboratory and the parties have been told.',
  withdraw: 'The dispute is withdrawn; the intake result stands.',
};
