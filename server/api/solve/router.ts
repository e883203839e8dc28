import { Router } from 'express';
import { requireUser } from '../../auth/guards.ts';
import { HttpError } from '../../http/errors.ts';
import { parseSolveInput } from '../../../shared/model/solveInput.ts';
import { solveSection } from '../../../shared/solver/index.ts';
import { errorForLog } from '../../log.ts';

/**
 * POST /api/solve: the solver as a service for signed-in users (scripts, other tools). Input is
 * validated by the same schema as the CLI and the browser worker; a 400 names every bad field.
 * The solver returns limits as results, so any valid input gets a 200.
 */
export function solveRouter(log: (line: string) => void): Router {
  const router = Router();
  router.post('/', requireUser, (req, res) => {
    const parsed = parseSolveInput(req.body);
    if (!parsed.ok) {
      throw new HttpError(400, 'invalid_input', `Invalid body: ${parsed.issues.map((i) => `${i.path} ${i.message}`).join('; ')}`, { issues: parsed.issues });
    }
    try {
      res.json(solveSection(parsed.value));
    } catch (err) {
      // The solver throws only for programmer errors; report it as such, not as a 500.
      log(`[solve] solver failed on valid input: ${errorForLog(err)}`);
      throw new HttpError(422, 'solver_failed', 'The solver could not handle this input; it has been logged for the developers.');
    }
  });
  return router;
}
