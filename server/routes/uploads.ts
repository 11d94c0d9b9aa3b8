/**
 * Project uploads (docs/api.md "Uploads"): multipart POST with one field "file", list, download, delete.
 * The body is read into memory by multer with the configured size limit; the type is sniffed from the
 * bytes (server/services/upload-checks.ts) and the file stored through the storage adapter.
 */
import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { UPLOAD_TYPES, type UploadContentType } from '../../shared/schemas/uploads';
import { requireAuth, type AppDeps } from '../http/context';
import { ApiError, notFound } from '../http/errors';
import { requireProjectRole, requireUploadRole } from '../services/access';
import { createUpload, deleteUpload, listUploads, UPLOAD_PERMISSION } from '../services/uploads';
import { checkQuotaRoom, createUploadRateLimiter } from '../services/upload-limits';
import { errorSummary, log } from '../http/logger';
import { StorageNotFoundError } from '../storage';

const mb = (bytes: number) => `${Math.round((bytes / (1024 * 1024)) * 10) / 10} MB`;

/** multer for one file in field "file", in memory, at most `maxBytes`; its errors in the API's shape. */
function singleFile(maxBytes: number): RequestHandler {
  const upload = multer({
    storage: multer.memoryStorage(),
    // File names in the part header are UTF-8 when the browser says nothing (every current browser sends UTF-8).
    defParamCharset: 'utf8',
    limits: { fileSize: maxBytes, files: 1, fields: 5, fieldSize: 1024, parts: 6, headerPairs: 50 },
  }).single('file');
  return (req, res, next) => {
    upload(req, res, (err: unknown) => {
      if (!err) return next();
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') {
          return next(
            new ApiError(413, 'payload_too_large', `The file is larger than the ${mb(maxBytes)} limit for attachments. Compress or split it and retry.`, { limitBytes: maxBytes }),
          );
        }
        if (err.code === 'LIMIT_UNEXPECTED_FILE' || err.code === 'LIMIT_FILE_COUNT') {
          return next(new ApiError(400, 'validation_failed', 'Send one file, in the form field "file".', { fields: { file: ['Send one file in the field "file"'] } }));
        }
        return next(new ApiError(400, 'bad_request', 'The upload could not be read.'));
      }
      // busboy: not multipart, malformed boundaries, aborted uploads.
      next(new ApiError(400, 'bad_request', 'The upload could not be read; send it as multipart/form-data with the field "file".'));
    });
  };
}

export function uploadRoutes(deps: AppDeps): Router {
  const { db, storage, config } = deps;
  const r = Router();
  const receive = singleFile(config.uploadMaxBytes);
  const uploadRate = createUploadRateLimiter(db, config.uploadQuota);

  r.get('/projects/:id/uploads', async (req, res) => {
    const { user } = requireAuth(res);
    await requireProjectRole(db, user.id, req.params.id, 'project.read');
    res.json({ uploads: await listUploads(db, req.params.id), maxBytes: config.uploadMaxBytes });
  });

  r.post(
    '/projects/:id/uploads',
    // Sign-in, role, the person's upload rate and the team's room are checked before a single byte of the body is read.
    async (req, res, next) => {
      const { user } = requireAuth(res);
      const { project } = await requireProjectRole(db, user.id, String(req.params.id), UPLOAD_PERMISSION);
      await uploadRate.consume(user.id);
      await checkQuotaRoom(db, config.uploadQuota, project.teamId);
      res.locals.uploadTeamId = project.teamId;
      next();
    },
    receive,
    async (req, res) => {
      const { user } = requireAuth(res);
      const file = req.file;
      if (!file) throw new ApiError(400, 'validation_failed', 'Choose a file to attach.', { fields: { file: ['Choose a file to attach'] } });
      const bytes = new Uint8Array(file.buffer.buffer, file.buffer.byteOffset, file.buffer.byteLength);
      const quota = { teamId: String(res.locals.uploadTeamId), limits: config.uploadQuota };
      res.status(201).json({ upload: await createUpload(db, storage, user.id, String(req.params.id), { originalName: file.originalname, bytes }, quota) });
    },
  );

  r.get('/uploads/:id/content', async (req, res) => {
    const { user } = requireAuth(res);
    const { upload } = await requireUploadRole(db, user.id, req.params.id, 'project.read');
    let stream;
    try {
      stream = await storage.get(upload.key);
    } catch (err) {
      if (err instanceof StorageNotFoundError) throw notFound('The file is listed but its contents are missing from storage.');
      throw err;
    }
    const type = UPLOAD_TYPES[upload.contentType as UploadContentType];
    // Photos show inline; data sheets download. Either way the browser must not guess another type,
    // and nothing served from here may run script (a sandboxed, resource-less document).
    const disposition = type?.image ? 'inline' : 'attachment';
    const ascii = upload.fileName.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_');
    res.set({
      'Content-Type': upload.contentType,
      'Content-Length': String(upload.size),
      'Content-Disposition': `${disposition}; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(upload.fileName)}`,
      'X-Content-Type-Options': 'nosniff',
      'Content-Security-Policy': "default-src 'none'; img-src 'self'; style-src 'unsafe-inline'; sandbox",
      'Cross-Origin-Resource-Policy': 'same-origin',
      'Cache-Control': 'private, no-store',
    });
    stream.on('error', (err) => {
      log().error({ uploadId: upload.id, key: upload.key, err: errorSummary(err) }, 'uploads: reading a stored file failed');
      res.destroy(err);
    });
    stream.pipe(res);
  });

  r.delete('/uploads/:id', async (req, res) => {
    const { user } = requireAuth(res);
    const { upload, role } = await requireUploadRole(db, user.id, req.params.id, 'project.read');
    await deleteUpload(db, storage, user.id, role, upload);
    res.status(204).end();
  });

  return r;
}
