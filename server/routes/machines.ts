import { Router } from 'express';
import { IdParamsSchema } from '../../shared/api/common';
import {
  CreateMachineInputSchema,
  MACHINES_PATH,
  MachineListQuerySchema,
  UpdateMachineInputSchema,
} from '../../shared/api/machines';
import { allow } from '../auth/middleware';
import { parse } from '../http/validate';
import {
  archiveMachine,
  createMachine,
  getMachine,
  listMachines,
  machineHistory,
  updateMachine,
} from '../services/machines';
import type { RouteDeps } from './deps';

export function machinesRouter({ db, now }: RouteDeps) {
  const router = Router();
  const one = `${MACHINES_PATH}/:id`;

  router.get(MACHINES_PATH, allow('machines', 'list'), async (req, res) => {
    const query = parse(MachineListQuerySchema, req.query, 'query');
    res.json(await listMachines(db, req.actor!, query));
  });
  router.post(MACHINES_PATH, allow('machines', 'create'), async (req, res) => {
    const input = parse(CreateMachineInputSchema, req.body);
    res.status(201).json(await createMachine(db, req.actor!, input, now()));
  });
  router.get(one, allow('machines', 'read'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    res.json(await getMachine(db, req.actor!, id));
  });
  router.get(`${one}/history`, allow('machines', 'read'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    res.json(await machineHistory(db, req.actor!, id));
  });
  router.patch(one, allow('machines', 'update'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    const input = parse(UpdateMachineInputSchema, req.body);
    res.json(await updateMachine(db, req.actor!, id, input, now()));
  });
  router.delete(one, allow('machines', 'delete'), async (req, res) => {
    const { id } = parse(IdParamsSchema, req.params, 'path');
    await archiveMachine(db, req.actor!, id, now());
    res.status(204).end();
  });
  return router;
}
