import { Router } from 'express';
import { IdParamsSchema, ListQuerySchema } from '../../shared/api/common';
import { CreateUserInputSchema, UpdateUserInputSchema, USERS_PATH } from '../../shared/api/users';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import { createUser, listUsers, updateUser } from '../services/users';
import type { RouteDeps } from './deps';

/** The owner's user admin; changing one's own password is `POST /api/auth/password`. */
export function usersRouter({ db, now }: RouteDeps) {
  const router = Router();
  router.get(USERS_PATH, allow('users', 'list'), async (req, res) => {
    res.json(await listUsers(db, req.actor!, parse(ListQuerySchema, req.query, 'query')));
  });
  router.post(USERS_PATH, allow('users', 'create'), async (req, res) => {
    const input = parse(CreateUserInputSchema, req.body);
    res.status(201).json(await createUser(db, req.actor!, input, now()));
  });
  router.patch(`${USERS_PATH}/:id`, allow('users', 'update'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const input = parse(UpdateUserInputSchema, req.body);
    res.json(await updateUser(db, req.actor!, id, input, now()));
  });
  return router;
}
