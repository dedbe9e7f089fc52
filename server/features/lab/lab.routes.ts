import { Router } from 'express';
import type { LabInfo } from '../../../shared/schemas/lab.js';

/** Public facts about the lab: GET /api/lab (name, time zone, address, and whether mail stays in the local capture). */
export function labRouter(lab: LabInfo): Router {
  const router = Router();
  router.get('/', (_req, res) => {
    res.json(lab);
  });
  return router;
}
