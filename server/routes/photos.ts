import type { RequestHandler } from 'express';
import { pipeline } from 'node:stream/promises';
import multer from 'multer';
import * as z from 'zod';
import { route } from './route';
import { id } from '../../shared/schemas';
import { photoUploadFields } from '../../shared/schemas/sync';
import { Invalid } from '../http/errors';
import { MAX_PHOTO_BYTES, photoFile, photoLimits, savePhoto, tooLarge } from '../services/photos.service';
import { inFlightPerPerson } from '../auth/throttle';

// Limits on everything multer accepts: one file, a few short fields, nothing else.
const upload = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: MAX_PHOTO_BYTES, files: 1, fields: 6, fieldSize: 1_000, parts: 8, headerPairs: 50 },
}).single('photo');

/** multer's own errors become typed ones naming what was wrong. */
const parsePhoto: RequestHandler = (req, res, next) =>
  upload(req, res, (err: unknown) => {
    if (!err) return next();
    if (err instanceof multer.MulterError) {
      if (err.code === 'LIMIT_FILE_SIZE') return next(tooLarge());
      const fieldName = err.code === 'LIMIT_UNEXPECTED_FILE' || err.code === 'LIMIT_FILE_COUNT' ? 'photo' : (err.field ?? 'body');
      return next(new Invalid(`upload refused: ${err.message}`, [{ field: fieldName, message: err.message }]));
    }
    // Anything else the multipart parser throws (e.g. "Malformed part header") is a bad request.
    const message = err instanceof Error ? err.message : 'malformed upload';
    next(new Invalid(`upload refused: the multipart body is malformed (${message})`, [{ field: 'body', message }]));
  });

const byId = z.object({ id });

const sendPhoto = (size: 'full' | 'thumb') =>
  route({
    method: 'get',
    path: size === 'full' ? '/api/photos/:id' : '/api/photos/:id/thumb',
    access: 'session.read',
    params: byId,
    handler: async ({ auth, params, res }) => {
      // Through the app, after the access check: the bucket itself is private.
      const file = await photoFile(auth, params.id, size);
      res.setHeader('Content-Type', 'image/jpeg');
      res.setHeader('Content-Length', String(file.bytes));
      res.setHeader('X-Content-Type-Options', 'nosniff');
      // A stored photo never changes: its id names it for good; only this person's browser keeps it.
      res.setHeader('Cache-Control', 'private, max-age=31536000, immutable');
      await pipeline(file.body, res);
      return undefined;
    },
  });

export const photoRoutes = [
  route({
    method: 'post',
    path: '/api/photos',
    access: 'session.record',
    // The place in flight is taken before multer buffers the file.
    before: [inFlightPerPerson('photo-uploads', photoLimits.inFlightPerPerson, 600, 'photo uploads'), parsePhoto],
    body: photoUploadFields,
    handler: async ({ auth, body, req, res }) => {
      const { photo, created } = await savePhoto(auth, body, req.file?.buffer);
      res.status(created ? 201 : 200);
      return photo;
    },
  }),
  sendPhoto('full'),
  sendPhoto('thumb'),
];
