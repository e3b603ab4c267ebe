import { Router } from 'express';
import { z } from 'zod';
import {
  addMemberSchema, createGroupSchema, createTokenSchema, invitationRequestSchema, setQuotaSchema, updateUserSchema, usageQuerySchema,
} from '../../shared/api/accounts.ts';
import { parseRequest } from '../../shared/api/parse.ts';
import { InvalidInputError } from '../../shared/errors.ts';
import { actorOf } from '../auth/actor.ts';
import type { AdminService } from './adminService.ts';
import type { TokensService } from './tokensService.ts';

const idParam = (raw: unknown, field: string): number => {
  const parsed = z.coerce.number().int().positive().max(2 ** 31 - 1).safeParse(raw);
  if (!parsed.success) throw new InvalidInputError(`${field}: "${String(raw)}" is not an id (a positive whole number)`, field);
  return parsed.data;
};

/** /tokens, /groups, /invitations and /admin/*: thin handlers over the tokens and admin services. */
export function accountsRouter(tokens: TokensService, admin: AdminService): Router {
  const router = Router();
  router.get('/tokens', async (req, res) => {
    res.json({ tokens: await tokens.list(actorOf(req)) });
  });
  router.post('/tokens', async (req, res) => {
    res.status(201).json(await tokens.create(actorOf(req), parseRequest(createTokenSchema, req.body ?? {})));
  });
  router.delete('/tokens/:id', async (req, res) => {
    await tokens.revoke(actorOf(req), idParam(req.params.id, 'id'));
    res.status(204).end();
  });
  router.get('/groups', async (req, res) => {
    res.json({ groups: await admin.groups(actorOf(req)) });
  });
  router.post('/invitations', async (req, res) => {
    res.status(201).json(await admin.invite(actorOf(req), parseRequest(invitationRequestSchema, req.body ?? {})));
  });

  router.get('/admin/users', async (_req, res) => {
    res.json({ users: await admin.listUsers() });
  });
  router.post('/admin/users', async (req, res) => {
    const input = parseRequest(invitationRequestSchema, req.body ?? {});
    res.status(201).json(await admin.invite(actorOf(req), { ...input, role: input.role ?? 'researcher' }));
  });
  router.patch('/admin/users/:id', async (req, res) => {
    res.json(await admin.updateUser(idParam(req.params.id, 'id'), parseRequest(updateUserSchema, req.body ?? {})));
  });
  router.put('/admin/users/:id/quota', async (req, res) => {
    res.json(await admin.setQuota(idParam(req.params.id, 'id'), parseRequest(setQuotaSchema, req.body ?? {})));
  });
  router.post('/admin/groups', async (req, res) => {
    res.status(201).json(await admin.createGroup(parseRequest(createGroupSchema, req.body ?? {}).name));
  });
  router.post('/admin/groups/:id/members', async (req, res) => {
    await admin.addMember(idParam(req.params.id, 'id'), parseRequest(addMemberSchema, req.body ?? {}).userId);
    res.status(204).end();
  });
  router.delete('/admin/groups/:id/members/:userId', async (req, res) => {
    await admin.removeMember(idParam(req.params.id, 'id'), idParam(req.params.userId, 'userId'));
    res.status(204).end();
  });
  router.get('/admin/usage', async (req, res) => {
    res.json(await admin.usage(parseRequest(usageQuerySchema, req.query).month));
  });
  return router;
}
