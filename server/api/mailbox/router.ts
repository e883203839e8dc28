import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../../context.ts';
import { currentUser } from '../../auth/guards.ts';
import { parseOr400 } from '../../http/validate.ts';
import { pageQuerySchema } from '../../../shared/model/teams.ts';
import * as service from './service.ts';
import { idSchema } from '../../../shared/model/ids.ts';

const listQuery = pageQuerySchema.extend({ scope: z.enum(['mine', 'all']).default('mine') });
const mailParams = z.object({ mailId: idSchema('mail', 'message') });

/** The development mailbox (mounted at /api/dev/mailbox outside production, signed in). */
export function mailboxRouter(ctx: AppContext): Router {
  const router = Router();
  router.get('/', async (req, res) => {
    const { scope, ...page } = parseOr400(listQuery, req.query, 'query');
    res.json(await service.listMail(ctx, currentUser(req), scope, page));
  });
  router.get('/:mailId', async (req, res) => {
    const { mailId } = parseOr400(mailParams, req.params, 'params');
    res.json(await service.getMail(ctx, currentUser(req), mailId));
  });
  return router;
}
