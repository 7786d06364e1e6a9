/**
 * Writes docs/model.schema.json from the zod model schema (packages/shared/src/model.ts):
 *   npx tsx packages/fe-core/src/cli/write-model-schema.ts
 * The shared test model.test.ts fails when the committed file differs from the schema.
 */
import { writeFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { modelJsonSchema } from '@phaseloop/shared';

export const MODEL_SCHEMA_PATH = resolve(dirname(fileURLToPath(import.meta.url)), '../../../../docs/model.schema.json');

export function modelSchemaText(): string {
  return JSON.stringify(modelJsonSchema(), null, 2) + '\n';
}

const invoked = process.argv[1] ? resolve(process.argv[1]) : '';
if (invoked === fileURLToPath(import.meta.url)) {
  writeFileSync(MODEL_SCHEMA_PATH, modelSchemaText());
  process.stderr.write(`wrote ${MODEL_SCHEMA_PATH}\n`);
}
