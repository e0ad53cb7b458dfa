import { paths } from '../paths';

/** The dashboard's sections in navigation order. Week is home: the desk review starts there. */
export const sections = [
  { path: paths.week, label: 'Week' },
  { path: paths.jobs, label: 'Jobs' },
  { path: paths.customers, label: 'Customers & machines' },
  { path: paths.invoices, label: 'Invoices' },
  { path: paths.mileage, label: 'Mileage' },
  { path: paths.reminders, label: 'Reminders' },
  { path: paths.settings, label: 'Settings' },
] as const;
