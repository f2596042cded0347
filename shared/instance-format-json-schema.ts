/**
 * The JSON Schema (draft 2020-12) of the instance format, generated from the zod schema so the
 * two cannot drift; instance-format.schema.json is this object, checked in for other tools.
 * Regenerate: npx tsx -e 'process.stdout.write(require("./shared/instance-format-json-schema.ts").instanceFormatJsonSchemaText())' > shared/instance-format.schema.json
 */
import { z } from 'zod';
import { InstanceDocumentSchema } from './instance-format';

/** The JSON Schema object of an instance document. */
export function instanceFormatJsonSchema(): Record<string, unknown> {
  return z.toJSONSchema(InstanceDocumentSchema, { target: 'draft-2020-12', io: 'input' }) as Record<string, unknown>;
}

/** The JSON Schema as the text of instance-format.schema.json (two-space indent, final newline). */
export function instanceFormatJsonSchemaText(): string {
  return `${JSON.stringify(instanceFormatJsonSchema(), null, 2)}\n`;
}
