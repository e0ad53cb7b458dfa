import type { Router } from 'express';
import type { RouteDeps } from './deps';
import { invoicePdfRouter } from './invoice-pdf';

/** The routers that answer with documents (PDFs) rather than JSON. */
export function documentRouters(deps: RouteDeps): Router[] {
  return [invoicePdfRouter(deps)];
}
