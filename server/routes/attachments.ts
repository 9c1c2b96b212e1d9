import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { config } from '../config';
import { AppError, fieldError } from '../errors';
import { checkAccess, endpoint, withAccess, type Access } from '../http';
import { contentDisposition, getAttachment, readAttachment } from '../services/attachments';
import { attachmentDownloadQuerySchema, attachmentParamsSchema, UPLOAD_FIELD } from '../../shared/schemas/attachments';

const upload = multer({
  storage: multer.memoryStorage(),
  // Browsers send file names as UTF-8 without saying so (WHATWG HTML, multipart/form-data encoding).
  defParamCharset: 'utf8',
  limits: { fileSize: config.maxUploadBytes, files: 1, fields: 10, fieldSize: 10_000, parts: 12 },
}).single(UPLOAD_FIELD);

/**
 * Middleware for a route that takes one uploaded document in the field `file`: checks access
 * first (nothing is read for a caller who may not upload), then reads the file into memory
 * within the size limit. The route's service checks the content and stores it.
 */
export function acceptUpload(access: Access): RequestHandler {
  // Named, so tools that list the routes (tests) can tell which ones take an upload.
  return withAccess(access, function acceptUpload(req, res, next) {
    try {
      checkAccess(access, req.actor);
    } catch (err) {
      next(err);
      return;
    }
    req.uploadRead = true;
    upload(req, res, (err: unknown) => {
      if (!err && req.file?.originalname.includes('\u0000')) {
        next(fieldError(UPLOAD_FIELD, 'has a file name with a NUL character'));
        return;
      }
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') {
          const mb = (config.maxUploadBytes / 1024 / 1024).toFixed(1);
          next(
            new AppError('TOO_LARGE', `The file is larger than the limit of ${mb} MB.`, 413, [
              { field: UPLOAD_FIELD, message: `is larger than ${config.maxUploadBytes} bytes` },
            ]),
          );
          return;
        }
        if (err.code === 'LIMIT_UNEXPECTED_FILE') {
          next(
            fieldError(UPLOAD_FIELD, `is required: send one file in the field "${UPLOAD_FIELD}" (a file came in "${err.field ?? '?'}")`),
          );
          return;
        }
        next(
          new AppError('BAD_UPLOAD', `The upload was refused: ${err.message}.`, 400, [
            { field: err.field ?? UPLOAD_FIELD, message: err.message },
          ]),
        );
        return;
      }
      if (err) {
        // The multipart parser's own errors (no boundary, a broken part header, a body cut short)
        // are a malformed request, not a server fault.
        const message = err instanceof Error ? err.message : String(err);
        next(
          new AppError('BAD_UPLOAD', `The upload could not be read (${message}); send it again as multipart/form-data.`, 400, [
            { field: UPLOAD_FIELD, message: 'could not be read' },
          ]),
        );
        return;
      }
      next();
    });
  });
}

export const attachmentsRouter = Router();

attachmentsRouter.get(
  '/:id/meta',
  endpoint({ access: 'signed-in', params: attachmentParamsSchema }, ({ actor, params }) => getAttachment(actor, params.id)),
);

attachmentsRouter.get(
  '/:id',
  endpoint(
    { access: 'signed-in', params: attachmentParamsSchema, query: attachmentDownloadQuerySchema },
    async ({ actor, params, query, res }) => {
      const { attachment, bytes } = await readAttachment(actor, params.id);
      res.setHeader('Content-Type', attachment.mimeType);
      res.setHeader('Content-Disposition', contentDisposition(attachment.filename, query.disposition === 'inline', attachment.mimeType));
      res.setHeader('Cache-Control', 'private, no-store');
      res.setHeader('X-Content-Type-Options', 'nosniff');
      res.status(200).send(bytes);
      return undefined;
    },
  ),
);
