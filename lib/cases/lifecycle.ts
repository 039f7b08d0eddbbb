import type { CaseStatus } from '@/lib/enums';
import type { Action } from '@/lib/auth/permissions';

/**
 * The case lifecycle: each transition, the states it leaves from, the state it reaches, the
 * permission it needs, and who is told. The data layer enforces it in one transaction each.
 */
export type TransitionName = 'dispatch' | 'receive' | 'submit_retest' | 'order_further_test' | 'withdraw';
export type Audience = 'supplier' | 'plant' | 'lab' | 'board';

export type TransitionSpec = {
  from: readonly CaseStatus[];
  to: CaseStatus;
  permission: Action<'case'>;
  label: string;
  notify: readonly Audience[];
};

export const transitions: Record<TransitionName, TransitionSpec> = {
  dispatch: { from: ['open'], to: 'awaiting_sample', permission: 'dispatch', label: 'Dispatch sample', notify: ['lab', 'supplier', 'board'] },
  receive: { from: ['awaiting_sample'], to: 'retest', permission: 'receive', label: 'Record receipt', notify: ['plant', 'supplier'] },
  submit_retest: { from: ['retest'], to: 'review', permission: 'retest', label: 'Submit retest', notify: ['board', 'plant', 'supplier'] },
  order_further_test: { from: ['review'], to: 'awaiting_sample', permission: 'order_further_test', label: 'Order a further test', notify: ['lab', 'plant', 'supplier'] },
  withdraw: { from: ['open', 'awaiting_sample', 'retest', 'review'], to: 'withdrawn', permission: 'withdraw', label: 'Withdraw the dispute', notify: ['plant', 'lab', 'board'] },
};

export const transitionNames = Object.keys(transitions) as TransitionName[];

export function isTransitionName(value: unknown): value is TransitionName {
  // Only a string: turning an object such as { toString: 0 } into a key would throw.
  return typeof value === 'string' && Object.hasOwn(transitions, value);
}

/** The transitions a role could make from a state, for showing the right buttons. */
export function availableTransitions(status: CaseStatus, can: (permission: Action<'case'>) => boolean): TransitionName[] {
  return transitionNames.filter((name) => transitions[name].from.includes(status) && can(transitions[name].permission));
}
