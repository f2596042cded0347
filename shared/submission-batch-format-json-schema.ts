/**
 * The JSON Schema (draft 2020-12) of the batch manifest, generated from the zod schema so the two
 * cannot drift; submission-batch-format.schema.json is this object, checked in for other tools.
 * Regenerate: npx tsx -e 'process.stdout.write(require("./shared/submission-batch-format-json-schema.ts").batchManifestJsonSchemaText())' > shared/submission-batch-format.schema.json
 */
import { z } from 'zod';
import { BatchManifestSchema } from './submission-batch-format';

/** The JSON Schema object of a batch manifest. */
export function batchManifestJsonSchema(): Record<string, unknown> {
  return z.toJSONSchema(BatchManifestSchema, { target: 'draft-2020-12', io: 'input' }) as Record<string, unknown>;
}

/** The JSON Schema as the text of submission-batch-format.schema.json (two-space indent, final newline). */
export function batchManifestJsonSchemaText(): string {
  return `${JSON.stringify(batchManifestJsonSchema(), null, 2)}\n`;
}
