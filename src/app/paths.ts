/** Every client route's path, so the router and the links never drift apart. */
export const paths = {
  /** Sends each person on to their role's first section (sections.ts, homePathFor). */
  home: '/',
  signIn: '/sign-in',
  week: '/week',
  jobs: '/jobs',
  customers: '/customers',
  invoices: '/invoices',
  mileage: '/mileage',
  reminders: '/reminders',
  settings: '/settings',
  job: '/jobs/:jobId',
  checkRun: '/jobs/:jobId/checks/:runId',
  customer: '/customers/:customerId',
  machine: '/machines/:machineId',
  invoice: '/invoices/:invoiceId',
} as const;

/** Links to one record's page. */
export const pathTo = {
  job: (id: number) => `/jobs/${id}`,
  checkRun: (jobId: number, runId: number | 'new') => `/jobs/${jobId}/checks/${runId}`,
  customer: (id: number) => `/customers/${id}`,
  machine: (id: number) => `/machines/${id}`,
  invoice: (id: number) => `/invoices/${id}`,
} as const;
