import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../../context.ts';
import { currentUser, requireUser } from '../../auth/guards.ts';
import { parseOr400 } from '../../http/validate.ts';
import { UNIT_SYSTEMS } from '../../../shared/flight/units.ts';
import { studyIdSchema } from '../../../shared/model/study.ts';
import { sketchReport } from './service.ts';
import { idSchema } from '../../../shared/model/ids.ts';

const sketchParams = z.object({ sketchId: idSchema('sketch') });
const reportQuery = z.object({ study: studyIdSchema.optional(), units: z.enum(UNIT_SYSTEMS).optional() });

/** PDF reports, generated on the server with pdfkit. Mounted at /api. */
export function reportsRouter(ctx: AppContext): Router {
  const router = Router();
  router.get('/sketches/:sketchId/report.pdf', requireUser, async (req, res) => {
    const { sketchId } = parseOr400(sketchParams, req.params, 'params');
    const query = parseOr400(reportQuery, req.query, 'query');
    const { pdf, fileName } = await sketchReport(ctx, currentUser(req), sketchId, query);
    res.set({ 'Content-Type': 'application/pdf', 'Content-Disposition': `attachment; filename="${fileName}"`, 'Cache-Control': 'no-store' });
    res.send(pdf);
  });
  return router;
}
