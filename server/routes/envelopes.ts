import * as z from 'zod';
import { route } from './route';
import { id } from '../../shared/schemas';
import { createDraftInput, saveDraftInput, sendSheetInput, signOffInput } from '../../shared/schemas/envelope';
import { createDraft, getEnvelope, listSessionEnvelopes, listSignedEnvelopes, reopen, saveDraft, signOff } from '../services/envelope.service';
import { sendSheet } from '../services/envelope-send.service';

const byId = z.object({ id });

export const envelopeRoutes = [
  route({ method: 'get', path: '/api/envelopes/signed', access: 'envelope.readSigned', handler: async ({ auth }) => listSignedEnvelopes(auth) }),
  route({
    method: 'get',
    path: '/api/sessions/:id/envelopes',
    access: 'envelope.read',
    params: byId,
    handler: async ({ auth, params }) => listSessionEnvelopes(auth, params.id),
  }),
  route({
    method: 'post',
    path: '/api/sessions/:id/envelopes',
    access: 'envelope.design',
    params: byId,
    body: createDraftInput,
    handler: async ({ auth, params, body, res }) => {
      res.status(201);
      return createDraft(auth, params.id, body.params);
    },
  }),
  route({
    method: 'get',
    path: '/api/envelopes/:id',
    access: 'envelope.readSigned',
    params: byId,
    handler: async ({ auth, params }) => getEnvelope(auth, params.id),
  }),
  route({
    method: 'put',
    path: '/api/envelopes/:id/params',
    access: 'envelope.design',
    params: byId,
    body: saveDraftInput,
    handler: async ({ auth, params, body }) => saveDraft(auth, params.id, body),
  }),
  route({
    method: 'post',
    path: '/api/envelopes/:id/sign',
    access: 'envelope.signOff',
    params: byId,
    body: signOffInput,
    handler: async ({ auth, params, body }) => signOff(auth, params.id, body),
  }),
  route({
    method: 'post',
    path: '/api/envelopes/:id/reopen',
    access: 'envelope.design',
    params: byId,
    handler: async ({ auth, params, res }) => {
      res.status(201);
      return reopen(auth, params.id);
    },
  }),
  route({
    method: 'post',
    path: '/api/envelopes/:id/send',
    access: 'envelope.send',
    params: byId,
    body: sendSheetInput,
    handler: async ({ auth, params, body, res }) => {
      res.status(201);
      return sendSheet(auth, params.id, body);
    },
  }),
];
