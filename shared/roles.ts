/**
 * Who may do what, written once. The staff roles, and each permission with the roles that hold it. The server's
 * route tables (`secureRouter` access), the client's router guards, the navigation and the `useCan()` hook all read
 * this file; `tests/api/role-matrix.test.ts` checks every route against it and fails on a role list written anywhere
 * else. To change who may do something, change it here.
 */

/** The staff roles. The customer has no account: they reach their own quote through a signed link. */
export const ROLES = ['owner', 'estimator', 'sales', 'workshop'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  owner: 'Owner',
  estimator: 'Estimator (finisher)',
  sales: 'Sales',
  workshop: 'Workshop planner',
};

export const ROLE_DUTIES: Record<Role, string> = {
  owner: 'Everything: price list, labour rates, tax, workshop settings, finishing systems, users, audit log, reports.',
  estimator: "Customers' pieces, measurements, estimates and revisions; progress and actual hours on jobs.",
  sales: 'Customers, quotes from priced estimates, discounts within the cap, acceptance and deposits.',
  workshop: 'Jobs from accepted quotes, the drying room and the polishers\u2019 week, progress.',
};

/** Each permission and the roles that hold it. */
export const PERMISSIONS = {
  /** Create, revise, change the state of, archive and duplicate estimates. */
  editEstimates: ['owner', 'estimator'],
  /** Reprice open estimates after a price change. */
  repriceEstimates: ['owner'],
  /** Add and change customers' pieces and their photos. */
  editPieces: ['owner', 'estimator'],
  /** Add, change and archive customers. */
  editCustomers: ['owner', 'estimator', 'sales'],
  /** Make, send and withdraw quotes; read the outbox, the options report and the flagged payments. */
  sendQuotes: ['owner', 'sales'],
  /** Give a discount above the workshop's cap. */
  discountBeyondCap: ['owner'],
  /** Issue invoices and credit notes, record payments by hand, and follow what is owed. */
  takePayments: ['owner', 'sales'],
  /** Refund a deposit. */
  refundDeposits: ['owner'],
  /** Read the price list and each material's price history. */
  readPriceList: ['owner', 'estimator', 'sales', 'workshop'],
  /** Change materials, packs and prices; read and apply the supplier's price file. */
  editPrices: ['owner'],
  /** Read the finishing systems and the wood species. */
  readFinishing: ['owner', 'estimator'],
  /** Change the finishing systems and the wood species. */
  editFinishing: ['owner'],
  /** Read the labour rates (to price an estimate or a quote). */
  readLabourRates: ['owner', 'estimator', 'sales'],
  /** Read and change the workshop's settings and labour rates. */
  editSettings: ['owner'],
  /** Add and change users and set their passwords. */
  manageUsers: ['owner'],
  /** Read the audit log. */
  readAuditLog: ['owner'],
  /** Make, book, move and cancel jobs in the drying room, and manage the polishers. */
  planRoom: ['owner', 'workshop'],
  /** Price work found during a job (a variation) and send it to the customer to approve. */
  proposeVariations: ['owner', 'estimator', 'sales'],
  /** Mark sessions done with their actual hours, and add photos to a job. */
  recordProgress: ['owner', 'estimator', 'workshop'],
  /** Read the material forecast and the stock on hand. */
  readForecast: ['owner', 'workshop'],
  /** Change the stock on hand. */
  editStock: ['owner'],
  /** Count the shelf, turn the forecast into purchase orders, send and receive them. */
  keepStock: ['owner', 'workshop'],
  /** What a job really cost: labour, materials used, overhead and the realised margin. */
  readCosting: ['owner'],
  /** The owner's reports (quotes, capacity, estimates against actuals) and their exports. */
  readReports: ['owner'],
  /** Read the actual hours against the estimates, and apply what they teach to the settings. */
  reviewActuals: ['owner'],
  /** Read the message templates and the messages sent to a customer. */
  readMessages: ['owner', 'sales', 'workshop'],
  /** Edit the message templates and when the quote reminders go. */
  editMessageTemplates: ['owner'],
  /** Tell the customer their piece is ready for collection or delivery. */
  tellCustomerReady: ['owner', 'sales', 'workshop'],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export const PERMISSION_NAMES = Object.keys(PERMISSIONS) as Permission[];

export function isPermission(value: unknown): value is Permission {
  return typeof value === 'string' && Object.hasOwn(PERMISSIONS, value);
}

/** The roles that hold a permission. */
export function rolesFor(permission: Permission): readonly Role[] {
  return PERMISSIONS[permission];
}

/** Whether a role holds a permission (no role, signed out: never). */
export function can(role: Role | null | undefined, permission: Permission): boolean {
  return role != null && (PERMISSIONS[permission] as readonly Role[]).includes(role);
}

/**
 * Who may call a route or open a page: the holders of a permission, any signed-in user, or the public (the
 * customer's signed link, health, sign-in). Never a list of roles: that belongs in `PERMISSIONS`.
 */
export type Access = Permission | 'signed-in' | 'public';

/** Whether a signed-in role passes an access rule. */
export function allows(access: Access, role: Role | null | undefined): boolean {
  if (access === 'public') return true;
  if (role == null) return false;
  return access === 'signed-in' || can(role, access);
}
