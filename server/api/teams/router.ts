import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../../context.ts';
import { currentUser } from '../../auth/guards.ts';
import { parseOr400 } from '../../http/validate.ts';
import { changeRoleSchema, createTeamSchema, inviteSchema, pageQuerySchema } from '../../../shared/model/teams.ts';
import * as service from './service.ts';
import { idSchema } from '../../../shared/model/ids.ts';

const teamParams = z.object({ teamId: idSchema('team') });
const memberParams = teamParams.extend({ userId: idSchema('user') });
const invitationParams = teamParams.extend({ invitationId: idSchema('invite', 'invitation') });

/** Teams, members, invitations and the audit trail: mounted at /api/teams (signed in). */
export function teamsRouter(ctx: AppContext, limits: { invite: import('express').RequestHandler }): Router {
  const router = Router();

  router.post('/', async (req, res) => {
    const { name } = parseOr400(createTeamSchema, req.body);
    res.status(201).json(await service.createTeam(ctx, currentUser(req).id, name));
  });

  router.delete('/:teamId', async (req, res) => {
    const { teamId } = parseOr400(teamParams, req.params, 'params');
    await service.deleteTeam(ctx, currentUser(req).id, teamId);
    res.status(204).end();
  });

  router.get('/:teamId/members', async (req, res) => {
    const { teamId } = parseOr400(teamParams, req.params, 'params');
    res.json(await service.listMembers(ctx, currentUser(req).id, teamId));
  });

  router.patch('/:teamId/members/:userId', async (req, res) => {
    const { teamId, userId } = parseOr400(memberParams, req.params, 'params');
    const { role } = parseOr400(changeRoleSchema, req.body);
    res.json(await service.changeRole(ctx, currentUser(req).id, teamId, userId, role));
  });

  router.delete('/:teamId/members/:userId', async (req, res) => {
    const { teamId, userId } = parseOr400(memberParams, req.params, 'params');
    await service.removeMember(ctx, currentUser(req).id, teamId, userId);
    res.status(204).end();
  });

  router.get('/:teamId/invitations', async (req, res) => {
    const { teamId } = parseOr400(teamParams, req.params, 'params');
    res.json(await service.listInvitations(ctx, currentUser(req).id, teamId));
  });

  router.post('/:teamId/invitations', limits.invite, async (req, res) => {
    const { teamId } = parseOr400(teamParams, req.params, 'params');
    const body = parseOr400(inviteSchema, req.body);
    res.status(201).json(await service.invite(ctx, currentUser(req).id, teamId, body));
  });

  router.delete('/:teamId/invitations/:invitationId', async (req, res) => {
    const { teamId, invitationId } = parseOr400(invitationParams, req.params, 'params');
    await service.revokeInvitation(ctx, currentUser(req).id, teamId, invitationId);
    res.status(204).end();
  });

  router.get('/:teamId/audit', async (req, res) => {
    const { teamId } = parseOr400(teamParams, req.params, 'params');
    const page = parseOr400(pageQuerySchema, req.query, 'query');
    res.json(await service.listAudit(ctx, currentUser(req).id, teamId, page));
  });

  return router;
}
