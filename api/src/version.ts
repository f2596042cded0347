/** The package version, read once from the root package.json. */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';

/** The `version` field of the root package.json. */
export const APP_VERSION: string = (JSON.parse(readFileSync(join(__dirname, '..', '..', 'package.json'), 'utf8')) as { version: string }).version;
