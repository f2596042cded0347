/** Parses request data with a zod schema; a ZodError reaches the error middleware as 400 VALIDATION_FAILED. */
import type { z } from 'zod';

/** Returns `value` parsed by `schema`, or throws the schema's ZodError. */
export function validate<S extends z.ZodType>(schema: S, value: unknown): z.output<S> {
  return schema.parse(value);
}
