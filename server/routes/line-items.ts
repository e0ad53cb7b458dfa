import { Router } from 'express';
import { IdParamsSchema } from '../../shared/api/common';
import {
  CreateLineItemInputSchema,
  JOB_LINE_ITEMS_PATH,
  LineItemListQuerySchema,
  LineItemParamsSchema,
  UpdateLineItemInputSchema,
} from '../../shared/api/line-items';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import { createLineItem, deleteLineItem, listLineItems, updateLineItem } from '../services/line-items';
import type { RouteDeps } from './deps';

export function lineItemsRouter({ db, now }: RouteDeps) {
  const router = Router();
  const one = `${JOB_LINE_ITEMS_PATH}/:itemId`;

  router.get(JOB_LINE_ITEMS_PATH, allow('lineItems', 'list'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const query = parse(LineItemListQuerySchema, req.query, 'query');
    res.json(await listLineItems(db, req.actor!, id, query));
  });
  router.post(JOB_LINE_ITEMS_PATH, allow('lineItems', 'create'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const input = parse(CreateLineItemInputSchema, req.body);
    res.status(201).json(await createLineItem(db, req.actor!, id, input, now()));
  });
  router.patch(one, allow('lineItems', 'update'), async (req, res) => {
    const { id, itemId } = parse(LineItemParamsSchema, req.params, 'path');
    const input = parse(UpdateLineItemInputSchema, req.body);
    res.json(await updateLineItem(db, req.actor!, id, itemId, input, now()));
  });
  router.delete(one, allow('lineItems', 'delete'), async (req, res) => {
    const { id, itemId } = parse(LineItemParamsSchema, req.params, 'path');
    await deleteLineItem(db, req.actor!, id, itemId, now());
    res.status(204).end();
  });
  return router;
}
