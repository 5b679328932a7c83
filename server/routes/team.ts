// The workshop's members and invitations. Reading needs team.read; everything that changes who
// is in the workshop, or with which role, needs team.manage (admins).
import * as z from 'zod';
import { route } from './route';
import type { AuthContext } from '../auth/context';
import { id } from '../../shared/schemas';
import { inviteInput, roleChangeInput } from '../../shared/schemas/account';
import { teamSettingsInput } from '../../shared/schemas/team';
import { changeRole, getTeam, invite, listInvitations, removeMember, revokeInvitation, updateTeamSettings } from '../services/team.service';

const byId = z.object({ id });

/** Removing one thing from the workshop by id (an admin's act), answered `{ ok: true }`. */
const removal = (path: string, remove: (auth: AuthContext, id: string) => Promise<void>) =>
  route({
    method: 'delete',
    path,
    access: 'team.manage',
    params: byId,
    handler: async ({ auth, params }) => {
      await remove(auth, params.id);
      return { ok: true };
    },
  });

export const teamRoutes = [
  route({ method: 'get', path: '/api/team', access: 'team.read', handler: async ({ auth }) => getTeam(auth) }),
  route({
    method: 'patch',
    path: '/api/team',
    access: 'team.manage',
    body: teamSettingsInput,
    handler: async ({ auth, body }) => updateTeamSettings(auth, body),
  }),
  route({
    method: 'get',
    path: '/api/team/invitations',
    access: 'team.manage',
    handler: async ({ auth }) => listInvitations(auth),
  }),
  route({
    method: 'post',
    path: '/api/team/invitations',
    access: 'team.manage',
    body: inviteInput,
    handler: async ({ auth, body, res }) => {
      const created = await invite(auth, body);
      res.status(201);
      return created;
    },
  }),
  removal('/api/team/invitations/:id', revokeInvitation),
  /** :id is the member's user id. */
  route({
    method: 'patch',
    path: '/api/team/members/:id',
    access: 'team.manage',
    params: byId,
    body: roleChangeInput,
    handler: async ({ auth, params, body }) => changeRole(auth, params.id, body.role),
  }),
  /** :id is the member's user id. */
  removal('/api/team/members/:id', removeMember),
];
