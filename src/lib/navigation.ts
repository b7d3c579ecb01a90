import { can, type Capability, type Role } from './permissions';
import type { IconName } from './icons';

export interface NavItem {
  href: string;
  label: string;
  icon: IconName;
  capability: Capability;
}

/** Side navigation of the desktop shell, filtered by the viewer's role. */
const NAV: NavItem[] = [
  { href: '/yard', label: 'Yard', icon: 'scan', capability: 'home.yard' },
  { href: '/portal', label: 'My bins', icon: 'home', capability: 'home.portal' },
  { href: '/portal/orders', label: 'Orders', icon: 'truck', capability: 'home.portal' },
  { href: '/portal/collections', label: 'Collections', icon: 'folded', capability: 'home.portal' },
  { href: '/portal/deliveries', label: 'Deliveries', icon: 'handover', capability: 'home.portal' },
  { href: '/portal/fill', label: 'Fill record', icon: 'lined', capability: 'home.portal' },
  { href: '/portal/counts', label: 'Monthly count', icon: 'check', capability: 'home.portal' },
  { href: '/portal/damage', label: 'Report damage', icon: 'alert', capability: 'home.portal' },
  { href: '/portal/statements', label: 'Statements', icon: 'sheet', capability: 'billing.own' },
  { href: '/portal/invoices', label: 'Invoices', icon: 'sheet', capability: 'billing.own' },
  { href: '/portal/people', label: 'People', icon: 'users', capability: 'home.portal' },
  { href: '/fleet', label: 'Pool overview', icon: 'grid', capability: 'fleet.view' },
  { href: '/trips', label: 'Trips', icon: 'route', capability: 'trips.view' },
  { href: '/planning/orders', label: 'Hire orders', icon: 'truck', capability: 'orders.view' },
  { href: '/planning/runs', label: 'Collection runs', icon: 'route', capability: 'orders.view' },
  { href: '/planning/test-days', label: 'Test days', icon: 'wrench', capability: 'inspections.view' },
  { href: '/repairs', label: 'Repairs', icon: 'wrench', capability: 'repairs.manage' },
  { href: '/planning/repositioning', label: 'Repositioning', icon: 'lanes', capability: 'orders.view' },
  { href: '/liners/stock', label: 'Liner stock', icon: 'lined', capability: 'liners.view' },
  { href: '/liners/purchase-orders', label: 'Liner orders', icon: 'truck', capability: 'liners.manage' },
  { href: '/fleet/flags', label: 'Scans to review', icon: 'alert', capability: 'scan.correct' },
  { href: '/requests', label: 'Requests', icon: 'inbox', capability: 'requests.view' },
  { href: '/planning/counts', label: 'Count differences', icon: 'check', capability: 'counts.resolve' },
  { href: '/billing', label: 'Billing', icon: 'sheet', capability: 'billing.manage' },
  { href: '/billing/invoices', label: 'Invoices', icon: 'sheet', capability: 'billing.manage' },
  { href: '/labels', label: 'Label sheets', icon: 'label', capability: 'labels.print' },
  { href: '/bins/new', label: 'Register bins', icon: 'plusBox', capability: 'bins.edit' },
  { href: '/admin/customers', label: 'Customers', icon: 'handover', capability: 'sites.manage' },
  { href: '/admin/sites', label: 'Sites', icon: 'home', capability: 'sites.manage' },
  { href: '/admin/bin-types', label: 'Bin types', icon: 'folded', capability: 'sites.manage' },
  { href: '/admin/trailers', label: 'Trailers', icon: 'truck', capability: 'sites.manage' },
  { href: '/admin/liner-specs', label: 'Liner specs', icon: 'lined', capability: 'liners.manage' },
  { href: '/admin/liner-suppliers', label: 'Liner suppliers', icon: 'handover', capability: 'liners.manage' },
  { href: '/admin/users', label: 'People', icon: 'users', capability: 'users.manage' },
  { href: '/admin/settings', label: 'Settings', icon: 'settings', capability: 'settings.manage' },
  { href: '/admin/mail', label: 'Sent mail', icon: 'mail', capability: 'mail.read' },
];

export function navFor(role: Role): NavItem[] {
  return NAV.filter((n) => can(role, n.capability));
}
