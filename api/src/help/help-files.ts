/**
 * The files behind the help routes, read once per process from the repository: the user's guide
 * (the guide part of README.md) and the published JSON Schemas (shared/*.schema.json, byte for byte).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { extractGuide, PUBLISHED_SCHEMAS, type PublishedSchema } from '@shared/help';

/** The guide's Markdown and each published schema's bytes. */
export interface HelpFiles {
  readonly guide: string;
  readonly schemas: ReadonlyMap<PublishedSchema, Buffer>;
}

const REPO_ROOT = join(__dirname, '..', '..', '..');

/** Reads the files under `root`; throws when README.md has no guide markers or a schema is missing. */
export function readHelpFiles(root: string = REPO_ROOT): HelpFiles {
  const guide = extractGuide(readFileSync(join(root, 'README.md'), 'utf8'));
  const schemas = new Map(PUBLISHED_SCHEMAS.map((name) => [name, readFileSync(join(root, 'shared', name))] as const));
  return { guide, schemas };
}

let cached: HelpFiles | undefined;

/** The repository's help files, read on the first call (at app start-up) and kept. */
export function repositoryHelpFiles(): HelpFiles {
  cached ??= readHelpFiles();
  return cached;
}
