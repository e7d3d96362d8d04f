import type { ZodError } from 'zod';
import { isApiError, type FieldErrors } from './api-client';

/**
 * Field errors keyed by the dotted path of each issue, exactly as the server shapes them
 * (server/lib/errors.ts zodFields), so one map serves errors found here and errors sent back.
 */
export function zodFieldErrors(error: ZodError): FieldErrors {
  const fields: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.join('.') || '_';
    fields[key] ??= issue.message;
  }
  return fields;
}

/** Field errors of a failed request, or none. */
export function serverFieldErrors(error: unknown): FieldErrors {
  return isApiError(error) ? error.fieldErrors : {};
}

/** The message of a failed request in words a person can act on. */
export function errorMessage(error: unknown): string {
  if (isApiError(error)) return error.message;
  return 'Benchrelay could not be reached. Check the connection and try again.';
}
