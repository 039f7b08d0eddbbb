import { createAccessControl } from 'better-auth/plugins/access';
import { defaultStatements } from 'better-auth/plugins/admin/access';

/**
 * What each role may do: the one place that says it. better-auth's admin plugin uses the same
 * roles for its own user-management endpoints; the app asks `can()` before every read and write.
 * Organisation scoping (which case, which delivery) is separate and lives in the data layer's queries.
 */
export const statement = {
  ...defaultStatements,
  case: ['list', 'read', 'open', 'withdraw', 'answer', 'dispatch', 'receive', 'retest', 'review', 'order_further_test', 'decide'],
  delivery: ['list', 'read', 'record'],
  intake: ['record', 'correct'],
  instrument: ['read', 'manage', 'check'],
  evidence: ['read', 'upload', 'remove'],
  note: ['read', 'write'],
  organisation: ['read', 'manage'],
  invitation: ['create', 'revoke'],
  rules: ['read', 'edit'],
  outbox: ['read'],
  assessment: ['run'],
} as const;

export const accessControl = createAccessControl(statement);

const partyCommon = {
  evidence: ['read', 'upload'],
  note: ['read', 'write'],
  rules: ['read'],
  assessment: ['run'],
} as const;

export const roles = {
  supplier: accessControl.newRole({
    ...partyCommon,
    case: ['list', 'read', 'open', 'withdraw'],
    delivery: ['list', 'read'],
  }),
  plant: accessControl.newRole({
    ...partyCommon,
    case: ['list', 'read', 'answer', 'dispatch'],
    delivery: ['list', 'read', 'record'],
    intake: ['record', 'correct'],
    instrument: ['read', 'manage', 'check'],
  }),
  lab: accessControl.newRole({
    ...partyCommon,
    case: ['list', 'read', 'receive', 'retest'],
    instrument: ['read', 'manage', 'check'],
  }),
  arbiter: accessControl.newRole({
    case: ['list', 'read', 'review', 'order_further_test', 'decide'],
    evidence: ['read'],
    note: ['read', 'write'],
    rules: ['read'],
    assessment: ['run'],
  }),
  // Separation of duties: an administrator runs the scheme but reads and decides no case. Of
  // better-auth's user powers it keeps only looking and barring: accounts come from invitations, and
  // nobody can change a role, set a password or act as someone else.
  admin: accessControl.newRole({
    user: ['list', 'get', 'ban'],
    session: ['list', 'revoke'],
    organisation: ['read', 'manage'],
    invitation: ['create', 'revoke'],
    instrument: ['read', 'manage'],
    rules: ['read', 'edit'],
    outbox: ['read'],
    assessment: ['run'],
  }),
};

export type Role = keyof typeof roles;
export const roleNames = Object.keys(roles) as Role[];
type Statement = typeof statement;
export type Resource = Exclude<keyof Statement, 'user' | 'session'>;
export type Action<R extends Resource> = Statement[R][number];

export function isRole(value: unknown): value is Role {
  // Own keys only: 'constructor' or '__proto__' is no role.
  return typeof value === 'string' && Object.hasOwn(roles, value);
}

/** Whether a role may perform an action at all; which records it may touch is the data layer's business. */
export function can<R extends Resource>(role: string, resource: R, action: Action<R>): boolean {
  if (!isRole(role)) return false;
  const request = { [resource]: [action] } as Parameters<(typeof roles)[Role]['authorize']>[0];
  return roles[role].authorize(request).success;
}

export const roleLabels: Record<Role, string> = {
  supplier: 'Supplier',
  plant: 'Plant laboratory',
  lab: 'Referee laboratory',
  arbiter: 'Arbiter',
  admin: 'Administrator',
};

/** The organisation kind each role belongs to; an admin may sit in any organisation. */
export const organisationKindForRole: Record<Role, readonly ('plant' | 'supplier' | 'lab' | 'board')[]> = {
  supplier: ['supplier'],
  plant: ['plant'],
  lab: ['lab'],
  arbiter: ['board'],
  admin: ['plant', 'supplier', 'lab', 'board'],
};
