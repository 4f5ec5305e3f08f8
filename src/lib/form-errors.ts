import { type FieldValues, type Path, type UseFormSetError } from 'react-hook-form';
import { errorCodes } from '@shared/errors';
import { ApiError } from '@/lib/api-client';

/**
 * Field messages from a 400 `validation_failed` answer, read from its `details` in either common
 * form: a list of zod issues (`[{ path: ['email'], message }]`) or a map (`{ email: 'message' }`
 * or `{ fieldErrors: { email: ['message'] } }`). Unknown shapes give an empty map.
 */
export function fieldErrorsFrom(error: unknown): Record<string, string> {
  if (!(error instanceof ApiError) || error.code !== errorCodes.validation) return {};
  const details = error.details;
  const out: Record<string, string> = {};
  const put = (key: unknown, message: unknown) => {
    const text = Array.isArray(message) ? message.find((item) => typeof item === 'string') : message;
    if (typeof key === 'string' && key && typeof text === 'string' && !(key in out)) out[key] = text;
  };
  if (Array.isArray(details)) {
    for (const issue of details) {
      if (issue && typeof issue === 'object') {
        const { path, message } = issue as { path?: unknown; message?: unknown };
        put(Array.isArray(path) ? path.join('.') : path, message);
      }
    }
  } else if (details && typeof details === 'object') {
    const map = (details as { fieldErrors?: unknown }).fieldErrors ?? details;
    if (map && typeof map === 'object') for (const [key, message] of Object.entries(map)) put(key, message);
  }
  return out;
}

/** Puts the server's field messages on the form's fields; returns true when any field got one. */
export function applyServerFieldErrors<T extends FieldValues>(error: unknown, setError: UseFormSetError<T>, fields: readonly Path<T>[]): boolean {
  const messages = fieldErrorsFrom(error);
  let applied = false;
  for (const field of fields) {
    const message = messages[field];
    if (message) {
      setError(field, { type: 'server', message });
      applied = true;
    }
  }
  return applied;
}
