import type { Router } from 'express';
import type { RouteDeps } from './deps';
import { estimatesRouter } from './estimates';
import { invoicePdfRouter } from './invoice-pdf';
import { jobReportRouter } from './job-report';

/** The documents the customer gets: invoice and report PDFs, estimates and their answers, the mail that sends them. */
export function documentRouters(deps: RouteDeps): Router[] {
  return [invoicePdfRouter(deps), jobReportRouter(deps), estimatesRouter(deps)];
}
