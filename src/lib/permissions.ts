// Who may do what: the one role × capability table that every page and every
// API route is checked against (middleware for paths, `endpoint()` for APIs).
// Customer scoping (only their own organisation's rows) is applied in the data
// layer on top of this; a capability here never widens what a customer sees.

export const ROLES = ['admin', 'planner', 'yard', 'customer'] as const;
export type Role = (typeof ROLES)[number];

export const CAPABILITIES = {
  'account.own': ['admin', 'planner', 'yard', 'customer'], // one's own account and sessions
  'home.yard': ['yard'],
  'home.portal': ['customer'],
  'fleet.view': ['planner', 'admin'],
  'bins.view': ['yard', 'planner', 'admin', 'customer'],
  'bins.edit': ['planner', 'admin'],
  'bins.import': ['planner', 'admin'],
  'labels.print': ['planner', 'admin'],
  'scan.record': ['yard', 'planner', 'admin', 'customer'],
  'scan.correct': ['planner', 'admin'],
  'inspections.record': ['yard', 'planner', 'admin'], // the test bench; never customers (records are internal)
  'inspections.view': ['yard', 'planner', 'admin'],
  'repairs.work': ['yard', 'planner', 'admin'], // repair orders: read one, record work on it (the yard on a phone)
  'repairs.manage': ['planner', 'admin'], // open one, estimate, place, retire the bin; the list
  'trips.view': ['planner', 'admin'],
  'loads.manage': ['yard', 'planner', 'admin'],
  'requests.view': ['planner', 'admin'],
  'orders.view': ['planner', 'admin'],
  'orders.edit': ['planner', 'admin'],
  'tariffs.manage': ['admin'],
  'liners.view': ['yard', 'planner', 'admin'],
  'liners.manage': ['planner', 'admin'], // liner specs, suppliers and their terms
  'liners.move': ['yard', 'planner', 'admin'], // receive, count, transfer and kit liners at one's home depot
  'portal.view': ['customer'],
  'counts.resolve': ['planner', 'admin'],
  'billing.manage': ['admin'], // statements, invoices, payments: money is the admin's
  'billing.own': ['customer'], // a customer's own statements (not a user limited to some sites: enforced in the data layer) // settling the differences of customers' monthly counts
  'users.manage': ['admin'],
  'settings.manage': ['admin'],
  'sites.manage': ['admin'],
  'mail.read': ['admin'],
} as const satisfies Record<string, readonly Role[]>;

export type Capability = keyof typeof CAPABILITIES;

export function isRole(value: unknown): value is Role {
  return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}

export function can(role: Role | null | undefined, capability: Capability): boolean {
  if (!role) return false;
  return (CAPABILITIES[capability] as readonly Role[]).includes(role);
}

/**
 * 'public' = anyone; 'signed-in' = any active user; 'denied' = nobody (a path
 * no rule names); otherwise a capability.
 */
export type Access = 'public' | 'signed-in' | 'denied' | Capability;

/**
 * Path rules, most specific first; the first that matches decides. A rule
 * matches its path and everything that starts with it (`/fleet` covers
 * `/fleet/bins`); a rule marked 'exact' matches only its path. A path no rule
 * names is denied to everyone (403): a new page or route needs its own rule,
 * and tests/unit/page-access.test.ts fails for any file under src/pages without one.
 */
export const PATH_RULES: ReadonlyArray<readonly [prefix: string, access: Access, match?: 'exact']> = [
  ['/', 'signed-in', 'exact'], // sends each role to its home
  ['/forbidden', 'public'], // the 403 page itself (the middleware rewrites to it)
  ['/404', 'public'], // the page for an address that does not exist (framed for a signed-in visitor)
  ['/login', 'public'],
  ['/account/invite', 'public'],
  ['/account/reset', 'public'],
  ['/api/auth/', 'public'],
  ['/api/health', 'public'],
  ['/account', 'account.own', 'exact'], // a person's own account: end all their sessions
  ['/api/account/sessions', 'account.own'],
  ['/api/account/mail', 'account.own'], // one's own choice about non-essential mail
  ['/api/account/', 'public'],
  ['/api/public/', 'public'],
  ['/api/payments/webhook', 'public'], // the payment provider's signed events: the signature is the check
  ['/8003/', 'public'], // Digital Link resolver: the page itself decides what a visitor sees
  ['/_astro/', 'public'],
  ['/fonts/', 'public'],
  ['/favicon', 'public'],
  ['/robots.txt', 'public'],
  ['/loads/confirm/', 'public'], // the receiving end confirms delivery through the link on the dispatch note
  ['/loads', 'loads.manage'],
  ['/api/loads', 'loads.manage'],
  ['/liners/lots/', 'liners.manage'], // a lot's trace: customers, fill sites, products; hold, recall, notices
  ['/api/liners/lots/', 'liners.manage'],
  ['/api/liners/receipts', 'liners.move'],
  ['/api/liners/counts', 'liners.move'],
  ['/api/liners/transfers', 'liners.move'],
  ['/api/liners/kits', 'liners.move'],
  ['/liners/purchase-orders', 'liners.manage'],
  ['/api/liners/purchase-orders', 'liners.manage'],
  ['/liners', 'liners.view'],
  ['/api/liners/', 'liners.view'],
  ['/yard', 'home.yard'],
  ['/portal/statements', 'billing.own'],
  ['/api/portal/statements', 'billing.own'],
  ['/portal/invoices', 'billing.own'],
  ['/api/portal/invoices', 'billing.own'],
  ['/portal', 'home.portal'],
  ['/api/portal/', 'portal.view'],
  ['/fleet', 'fleet.view'],
  ['/api/fleet/', 'fleet.view'],
  ['/trips', 'trips.view'],
  ['/api/trips/', 'trips.view'],
  ['/labels', 'labels.print'],
  ['/api/labels/', 'labels.print'],
  ['/requests', 'requests.view'],
  // Hire orders: the list, the order page and the form; the API's POSTs check orders.edit themselves.
  ['/planning/test-days', 'inspections.view'],
  ['/planning/orders/new', 'orders.edit'],
  ['/planning/orders', 'orders.view'],
  ['/planning/repositioning', 'orders.view'],
  ['/planning/counts', 'counts.resolve'],
  ['/api/planning/counts', 'counts.resolve'],
  ['/planning/runs', 'orders.view'], // collection truck runs; the API's POST/PATCH check orders.edit themselves
  ['/api/planning/orders', 'orders.view'],
  ['/api/planning/runs', 'orders.view'],
  ['/api/planning/repositioning/', 'orders.edit'],
  ['/api/requests/', 'requests.view'],
  ['/billing', 'billing.manage'],
  ['/api/billing/', 'billing.manage'],
  ['/admin/mail', 'mail.read'],
  ['/admin/users', 'users.manage'],
  ['/api/admin/users', 'users.manage'],
  ['/admin/settings', 'settings.manage'],
  ['/api/admin/settings', 'settings.manage'],
  // Setting up the pool: customers, sites (depots, repair shops, recycling points, customers' sites), bin types.
  ['/admin/sites', 'sites.manage'],
  ['/admin/customers', 'sites.manage'],
  ['/admin/bin-types', 'sites.manage'],
  ['/admin/trailers', 'sites.manage'],
  ['/api/admin/trailers', 'sites.manage'],
  ['/api/admin/sites', 'sites.manage'],
  ['/api/admin/customers', 'sites.manage'],
  ['/api/admin/bin-types', 'sites.manage'],
  ['/admin/liner-', 'liners.manage'],
  ['/api/admin/liner-', 'liners.manage'],
  ['/api/admin/tariffs', 'tariffs.manage'],
  ['/api/admin/', 'settings.manage'],
  ['/admin', 'users.manage'],
  // The register (before the general /bins rule). /bins/<grai>/edit is under
  // the /bins prefix: its page and endpoint check bins.edit themselves.
  ['/bins/new', 'bins.edit'],
  ['/bins/import', 'bins.import'],
  ['/bins/export', 'bins.import'],
  ['/api/bins/register', 'bins.edit'],
  ['/api/bins/import/', 'bins.import'],
  ['/bins', 'bins.view'],
  ['/api/bins', 'bins.view'],
  ['/api/scan-events', 'scan.record'],
  ['/inspections', 'inspections.view'], // printable records; /bins/<grai>/inspect checks inspections.record itself
  ['/api/inspections', 'inspections.record'],
  ['/repairs', 'repairs.manage', 'exact'], // the planners' list
  ['/repairs/', 'repairs.work'], // one order; the yard records work on it
  ['/api/repairs', 'repairs.manage', 'exact'], // open one
  ['/api/repairs/', 'repairs.work'], // endpoint() checks repairs.manage on the planners' routes
  ['/api/attachments', 'scan.record'], // photos for scans; a customer's only their own organisation's (checked per file)
  ['/api/yard/', 'home.yard'],
];

export function accessFor(pathname: string): Access {
  for (const [prefix, access, match] of PATH_RULES) {
    if (pathname === prefix) return access;
    if (match === 'exact') continue;
    if (pathname.startsWith(prefix)) return access;
    if (prefix.endsWith('/') && pathname === prefix.slice(0, -1)) return access;
  }
  return 'denied';
}

export const HOME_BY_ROLE: Record<Role, string> = {
  yard: '/yard',
  planner: '/fleet',
  admin: '/fleet',
  customer: '/portal',
};
