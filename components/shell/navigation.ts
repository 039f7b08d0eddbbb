import type { Actor } from '@/lib/auth/actor';
import { can } from '@/lib/auth/permissions';
import { outboxEnabled } from '@/lib/env';

export type NavItem = { href: string; label: string };

/** What the navigation offers each role: exactly what the permissions allow. */
export function navigationFor(actor: Actor): NavItem[] {
  const items: NavItem[] = [{ href: '/desk', label: 'Desk' }];
  if (can(actor.role, 'case', 'list')) items.push({ href: '/cases', label: 'Cases' });
  if (can(actor.role, 'delivery', 'list')) items.push({ href: '/deliveries', label: 'Deliveries' });
  if (can(actor.role, 'case', 'decide')) items.push({ href: '/board', label: 'Board' });
  if (can(actor.role, 'intake', 'record')) items.push({ href: '/intake', label: 'Intake' });
  if (can(actor.role, 'instrument', 'read')) items.push({ href: '/instruments', label: 'Instruments' });
  if (can(actor.role, 'organisation', 'manage')) items.push({ href: '/admin/organisations', label: 'Organisations' });
  if (can(actor.role, 'invitation', 'create')) items.push({ href: '/admin/users', label: 'People' });
  if (can(actor.role, 'rules', 'edit')) items.push({ href: '/admin/rules', label: 'Rules' });
  else if (can(actor.role, 'rules', 'read')) items.push({ href: '/rules', label: 'Rules' });
  if (can(actor.role, 'outbox', 'read') && outboxEnabled()) items.push({ href: '/outbox', label: 'Outbox' });
  items.push({ href: '/about/method', label: 'About the method' });
  return items;
}
