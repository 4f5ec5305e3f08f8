import { rmSync } from 'node:fs';
import { validateMappingInputSchema } from '@shared/comparisons';
import { errorCodes } from '@shared/errors';
import type { RequestHandler } from 'express';
import multer from 'multer';
import { currentUser } from '../auth/guards';
import type { AppContext } from '../context';
import { storageFailureKind } from '../db/storage-errors';
import { AppError } from '../errors';
import { defineRoute, type RouteDefinition } from '../http/routes';
import { idParams } from '../http/validate';
import { ensureRoomFor } from './free-space';
import { getHoldout, validateMapping } from './service';
import { storeUpload } from './staged-uploads';

/** The multipart field `sheet`: a worksheet's name (1 to 100 characters), or absent / empty for the first sheet. */
function uploadSheet(body: Record<string, unknown>): string | null {
  const sheet = body.sheet;
  if (sheet === undefined || sheet === '') return null;
  if (typeof sheet !== 'string' || sheet.length > 100) {
    throw new AppError(errorCodes.badInput, 'The field "sheet" must be one worksheet\'s name (at most 100 characters).', 400, { field: 'sheet' });
  }
  return sheet;
}

export function holdoutRoutes(ctx: AppContext): RouteDefinition[] {
  // Streamed to a random name in the upload folder (never the client's name), at most
  // UPLOAD_LIMIT_MB (→ 413); multer removes a partial file itself when it refuses one.
  // `defParamCharset: 'utf8'` reads a file name sent without a charset as UTF-8 (multer 2; not in its types yet).
  const upload = multer({
    dest: ctx.uploadDir,
    limits: { fileSize: ctx.config.uploadLimitMb * 1024 * 1024, files: 1, fields: 10, parts: 12 },
    defParamCharset: 'utf8',
  } as multer.Options);
  const receive = upload.single('file');
  // busboy's own complaints about a malformed multipart body ("Malformed part header", "Unexpected
  // end of form") are the client's: a 400, not a 500. multer's limits stay as they are (413 …).
  // A full disk while receiving (ENOSPC, or EFBIG at a file-size limit) is the server's: 507,
  // logged by the error middleware. Before receiving, the declared size must fit (free-space.ts).
  const receiveFile: RequestHandler = (req, res, next) => {
    const declared = Number(req.headers['content-length']);
    if (Number.isFinite(declared) && declared > 0) {
      try {
        ensureRoomFor(ctx.config.databasePath, declared, 3);
      } catch (error) {
        next(error);
        return;
      }
    }
    receive(req, res, (error?: unknown) => {
      if (storageFailureKind(error) !== null) {
        next(error);
        return;
      }
      if (error instanceof Error && !(error instanceof multer.MulterError) && !(error instanceof AppError)) {
        next(new AppError(errorCodes.badInput, `The upload could not be read as a multipart form (${error.message}).`, 400));
        return;
      }
      next(error);
    });
  };

  return [
    defineRoute({
      method: 'post',
      path: '/holdouts',
      access: ['modeler'],
      summary:
        'Upload a holdout CSV or .xlsx (multipart field `file`; for a workbook, optional field `sheet`: the worksheet to read, default the first) → 201 the holdout with columns, preview and guess; 400 naming sheet, row and column, or a sheet the workbook lacks; 413 over the limit; 507 when the disk has no room for it',
      before: [receiveFile],
      handler: async (req, res) => {
        const file = (req as unknown as { file?: Express.Multer.File }).file;
        if (!file) throw new AppError(errorCodes.badInput, 'Attach the holdout CSV as the multipart field "file".', 400);
        try {
          const sheet = uploadSheet((req.body ?? {}) as Record<string, unknown>);
          // Recorded as staged while it is stored: another instance finishes it if this one stops (staged-uploads.ts).
          const holdout = await storeUpload(ctx, currentUser(req), { path: file.path, originalname: file.originalname, sheet });
          res.status(201);
          return holdout;
        } finally {
          rmSync(file.path, { force: true });
        }
      },
    }),
    defineRoute({
      method: 'get',
      path: '/holdouts/:id',
      access: 'signed-in',
      summary: 'A holdout: file name, SHA-256, size, rows, columns, mapping guess; the first rows (cells cut to 200 characters, 64 KB) to modeler and analyst only',
      validate: { params: idParams },
      handler: async (req) => getHoldout(ctx.dataSource, req.params.id, currentUser(req)),
    }),
    defineRoute({
      method: 'post',
      path: '/holdouts/:id/validate',
      access: ['modeler'],
      summary: 'Check a mapping against the holdout → { ok, errors (first 50, with row and column), summary }',
      validate: { params: idParams, body: validateMappingInputSchema },
      handler: async (req) => validateMapping(ctx, req.params.id, req.body.mapping, req.body.dropMissing),
    }),
  ];
}
