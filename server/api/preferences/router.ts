import { Router } from 'express';
import type { AppContext } from '../../context.ts';
import { currentUser } from '../../auth/guards.ts';
import { parseOr400 } from '../../http/validate.ts';
import { updatePreferencesSchema } from '../../../shared/model/preferences.ts';
import * as service from './service.ts';

/** The signed-in person's own settings (display units). Mounted at /api/preferences behind requireUser. */
export function preferencesRouter(ctx: AppContext): Router {
  const router = Router();
  router.get('/', async (req, res) => {
    res.json(await service.getPreferences(ctx.db, currentUser(req).id));
  });
  router.patch('/', async (req, res) => {
    const body = parseOr400(updatePreferencesSchema, req.body);
    res.json(await service.updatePreferences(ctx.db, currentUser(req).id, body));
  });
  return router;
}
