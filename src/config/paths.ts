/** Every client path in one place. */
export const paths = {
  signIn: '/signin',
  /** "Forgot your password?": ask for a link, then choose a new password from it. */
  forgotPassword: '/reset-password',
  resetPassword: '/reset-password/:token',
  /** A new workshop's owner signs up, then confirms their address from the e-mailed link (no sign-in). */
  signUp: '/signup',
  confirmEmail: '/confirm/:token',
  home: '/',
  users: '/users',
  customers: '/customers',
  customer: '/customers/:customerId',
  piece: '/pieces/:pieceId',
  estimates: '/estimates',
  newEstimate: '/estimates/new',
  estimate: '/estimates/:estimateId',
  editEstimate: '/estimates/:estimateId/edit',
  compareRevisions: '/estimates/:estimateId/compare',
  priceList: '/price-list',
  priceFile: '/price-list/upload',
  materialHistory: '/price-list/materials/:materialId',
  reprice: '/price-list/reprice',
  settings: '/settings',
  /** The owner's message templates and reminder days. */
  messageTemplates: '/settings/messages',
  finishingSystems: '/finishing-systems',
  finishingSystem: '/finishing-systems/:systemId',
  species: '/species',
  auditLog: '/audit-log',
  planning: '/planning',
  planningJob: '/planning/jobs/:jobId',
  actuals: '/actuals',
  forecast: '/forecast',
  stock: '/stock',
  reports: '/reports',
  quotes: '/quotes',
  quote: '/quotes/:quoteId',
  outbox: '/outbox',
  /** What customers owe, by age; and one job's account (by its accepted quote). */
  owed: '/accounts/owed',
  account: '/accounts/quotes/:quoteId',
  /** The customer's page, opened from the signed link in the e-mail (no sign-in). */
  publicQuote: '/q/:token',
  /** Extra work found during a job, for the customer to approve (its own signed link). */
  publicVariation: '/v/:token',
  /** An invitation to join a workshop, opened from the e-mailed link (no sign-in). */
  invite: '/invite/:token',
} as const;

/** Addresses of one record, built from the patterns above. */
export const pathTo = {
  customer: (id: number) => `/customers/${id}`,
  piece: (id: number) => `/pieces/${id}`,
  estimate: (id: number) => `/estimates/${id}`,
  editEstimate: (id: number) => `/estimates/${id}/edit`,
  newEstimate: (pieceId: number) => `/estimates/new?pieceId=${pieceId}`,
  compareRevisions: (id: number, a: number, b: number) => `/estimates/${id}/compare?a=${a}&b=${b}`,
  estimatesOf: (customerId: number) => `/estimates?customerId=${customerId}`,
  quote: (id: number) => `/quotes/${id}`,
  account: (quoteId: number) => `/accounts/quotes/${quoteId}`,
};

/** Addresses of one price-list or finishing record. */
export const ownerPathTo = {
  materialHistory: (id: number) => `/price-list/materials/${id}`,
  finishingSystem: (id: number) => `/finishing-systems/${id}`,
};
