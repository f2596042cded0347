/**
 * The user's guide and the published JSON Schemas: their stable URLs, and how the guide is cut
 * out of README.md. The guide is one Markdown text, the part of README.md between GUIDE_START and
 * GUIDE_END; the API serves it and the web app's Help page renders it. Zod-free, no I/O.
 */

/** GET: the user's guide as Markdown (text/markdown), public. */
export const HELP_GUIDE_PATH = '/api/help/guide';

/** The folder of the published schemas: GET `${SCHEMAS_PATH}/<name>`, public. */
export const SCHEMAS_PATH = '/api/schemas';

/** The JSON Schemas the API publishes, by file name (the same names as in shared/). */
export const PUBLISHED_SCHEMAS = ['plan-format.schema.json', 'instance-format.schema.json', 'trial-log.schema.json', 'submission-batch-format.schema.json'] as const;
export type PublishedSchema = (typeof PUBLISHED_SCHEMAS)[number];

/** The line before the guide in README.md (an HTML comment, invisible where README is rendered). */
export const GUIDE_START = '<!-- user-guide:start -->';

/** The line after the guide in README.md. */
export const GUIDE_END = '<!-- user-guide:end -->';

/** The address `npm start` serves the app on; README.md links into the app through it. */
export const LOCAL_APP_ORIGIN = 'http://127.0.0.1:4300';

/** The stable URL (path) of a published schema. */
export function schemaUrl(name: PublishedSchema): string {
  return `${SCHEMAS_PATH}/${name}`;
}

/** The guide part of README.md's text, trimmed; throws when the markers are missing or out of order. */
export function extractGuide(readme: string): string {
  const start = readme.indexOf(GUIDE_START);
  const end = readme.indexOf(GUIDE_END);
  if (start < 0 || end < 0 || end < start) {
    throw new Error(`README.md must hold the user's guide between the lines ${GUIDE_START} and ${GUIDE_END}`);
  }
  return readme.slice(start + GUIDE_START.length, end).trim();
}

/**
 * Where a link of the guide leads inside the app. README.md links to repository files and to
 * pages of a local `npm start` (LOCAL_APP_ORIGIN); in the app the schema files become their stable
 * URLs, local pages become paths of this app (whatever its host), other repository files (which
 * the app does not serve) become null (shown as plain text), and other http(s) URLs stay.
 */
export function appHrefOf(href: string): string | null {
  const schema = PUBLISHED_SCHEMAS.find((name) => href === `shared/${name}` || href === `./shared/${name}`);
  if (schema) return schemaUrl(schema);
  if (href === LOCAL_APP_ORIGIN || href.startsWith(`${LOCAL_APP_ORIGIN}/`)) return href.slice(LOCAL_APP_ORIGIN.length) || '/';
  if (href.startsWith('/') && !href.startsWith('//')) return href;
  if (/^https?:\/\//i.test(href)) return href;
  return null;
}
