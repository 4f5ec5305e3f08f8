import { z } from 'zod';

/** The one JSON error shape every API error uses. */
export const apiErrorSchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    details: z.unknown().optional(),
  }),
});
export type ApiErrorBody = z.infer<typeof apiErrorSchema>;

/** Error codes the client may branch on. Others may appear; the message is always readable. */
export const errorCodes = {
  validation: 'validation_failed',
  unauthenticated: 'unauthenticated',
  forbidden: 'forbidden',
  notFound: 'not_found',
  conflict: 'conflict',
  csrf: 'csrf_invalid',
  rateLimited: 'rate_limited',
  tooLarge: 'payload_too_large',
  badInput: 'bad_input',
  internal: 'internal_error',
  /** 507: the server's disk is full; nothing of the request was stored. */
  storageFull: 'storage_full',
  /** 503: the server's storage failed (I/O error, read-only); nothing of the request was stored. */
  storageUnavailable: 'storage_unavailable',
} as const;
