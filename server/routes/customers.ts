import { Router } from 'express';
import { IdParamsSchema } from '../../shared/api/common';
import {
  CreateCustomerInputSchema,
  CUSTOMERS_PATH,
  CustomerListQuerySchema,
  UpdateCustomerInputSchema,
} from '../../shared/api/customers';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import {
  archiveCustomer,
  createCustomer,
  getCustomer,
  listCustomers,
  updateCustomer,
} from '../services/customers';
import type { RouteDeps } from './deps';

export function customersRouter({ db, now }: RouteDeps) {
  const router = Router();
  const one = `${CUSTOMERS_PATH}/:id`;

  router.get(CUSTOMERS_PATH, allow('customers', 'list'), async (req, res) => {
    const query = parse(CustomerListQuerySchema, req.query, 'query');
    res.json(await listCustomers(db, req.actor!, query));
  });
  router.post(CUSTOMERS_PATH, allow('customers', 'create'), async (req, res) => {
    const input = parse(CreateCustomerInputSchema, req.body);
    res.status(201).json(await createCustomer(db, req.actor!, input, now()));
  });
  router.get(one, allow('customers', 'read'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    res.json(await getCustomer(db, req.actor!, id));
  });
  router.patch(one, allow('customers', 'update'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const input = parse(UpdateCustomerInputSchema, req.body);
    res.json(await updateCustomer(db, req.actor!, id, input, now()));
  });
  router.delete(one, allow('customers', 'delete'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    await archiveCustomer(db, req.actor!, id, now());
    res.status(204).end();
  });
  return router;
}
