import type { z } from 'zod';
import { validationFailed } from './errors';

/** Parse a request part with a zod schema; throws validation_failed with details.fields. */
export function parse<S extends z.ZodType>(schema: S, value: unknown): z.output<S> {
  const result = schema.safeParse(value ?? {});
  if (!result.success) throw validationFailed(result.error);
  return result.data;
}
