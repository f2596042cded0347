/**
 * Helpers of the instance library suites: a server on a fresh database, signed-in clients,
 * multipart uploads through supertest (with the session cookie and CSRF header), zips built
 * with yazl, and the open benchmark files read in place from benchmarks/datasets/grid-benchmarks/.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import request from 'supertest';
import yazl from 'yazl';
import { CSRF_HEADER } from '@shared/auth';
import { startServer, type RunningServer } from '../../api/src/app';
import { loadConfig } from '../../api/src/config';
import { createSequelize } from '../../api/src/db/sequelize';
import { CookieJar } from '../../api/src/dev/cookie-jar';
import { clientFor, signInAs, type SignedInClient } from '../../api/src/dev/sign-in-as';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { OPEN_GRID_BENCHMARKS_DIR } from '../../benchmarks/datasets/open-grid-benchmarks';

/** The open benchmark files (N. Sturtevant, IEEE TCIAIG 2012; R. Stern et al., SoCS 2019), read in place. */
export const DATASET = OPEN_GRID_BENCHMARKS_DIR;

/** Every map and scenario file name of the dataset, sorted. */
export function datasetFiles(): string[] {
  return readdirSync(DATASET).filter((f) => f.endsWith('.map') || f.endsWith('.scen')).sort();
}

/** The bytes of one dataset file. */
export function datasetBytes(name: string): Buffer {
  return readFileSync(join(DATASET, name));
}

/** A running app on its own database, and a way to run SQL on that database. */
export interface LibraryServer {
  readonly server: RunningServer;
  readonly db: TestDatabase;
  /** Runs one SQL statement and returns its rows. */
  sql<T = Record<string, unknown>>(text: string, replacements?: Record<string, unknown>): Promise<T[]>;
  close(): Promise<void>;
}

/** Starts the full app (fake OAuth) on a fresh migrated database. */
export async function startLibraryServer(): Promise<LibraryServer> {
  const db = await createTestDatabase();
  const config = { ...loadConfig({ NODE_ENV: 'test', LOG_LEVEL: 'silent' }).config, webDist: '/nonexistent' };
  const server = await startServer({ config, databaseUrl: db.url, port: 0, fakeOAuthPort: 0 });
  const sequelize = createSequelize(db.url, { poolMax: 1 });
  return {
    server,
    db,
    async sql<T>(text: string, replacements: Record<string, unknown> = {}) {
      const [rows] = await sequelize.query(text, { replacements });
      return rows as T[];
    },
    async close() {
      await sequelize.close();
      await server.close();
      await db.drop();
    },
  };
}

/** A visitor client holding only the CSRF cookie. */
export async function visitorClient(baseUrl: string): Promise<SignedInClient> {
  const jar = new CookieJar();
  jar.store(await fetch(`${baseUrl}/api/me`));
  return clientFor(baseUrl, jar);
}

export { signInAs, type SignedInClient };

/** JSON request options for SignedInClient.request. */
export const json = (method: string, body: unknown): RequestInit => ({ method, body: JSON.stringify(body) });

/** A file for upload(): a name and its bytes. */
export interface UploadFile {
  readonly name: string;
  readonly bytes: Buffer;
}

/** POST /api/instance-sets/:id/files as multipart through supertest, as `client`. */
export function upload(baseUrl: string, client: SignedInClient, setId: number, files: readonly UploadFile[]): request.Test {
  let req = request(baseUrl)
    .post(`/api/instance-sets/${setId}/files`)
    .set('cookie', client.jar.header())
    .set(CSRF_HEADER, client.csrfToken);
  for (const f of files) req = req.attach('files', f.bytes, { filename: f.name, contentType: 'application/octet-stream' });
  return req;
}

/** Builds a zip in memory with yazl (deflated entries; names ending in '/' become directories). */
export function buildZip(entries: readonly UploadFile[]): Promise<Buffer> {
  const zip = new yazl.ZipFile();
  for (const e of entries) {
    if (e.name.endsWith('/')) zip.addEmptyDirectory(e.name);
    else zip.addBuffer(e.bytes, e.name);
  }
  zip.end();
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    zip.outputStream.on('data', (c: Buffer) => chunks.push(c));
    zip.outputStream.on('end', () => resolve(Buffer.concat(chunks)));
    zip.outputStream.on('error', reject);
  });
}

/** Creates an instance set as `client` and returns its id. */
export async function createSet(client: SignedInClient, name: string, visibility: 'public' | 'private' = 'private'): Promise<number> {
  const res = await client.request('/api/instance-sets', json('POST', { name, visibility, description: `${name} (test)`, source: 'made in a test' }));
  if (res.status !== 201) throw new Error(`create set ${name}: ${res.status} ${await res.text()}`);
  return ((await res.json()) as { id: number }).id;
}

/** Sets a role directly in the database (the next request sees it: sessions reload the account). */
export async function setRole(lib: LibraryServer, login: string, role: 'researcher' | 'maintainer' | 'admin'): Promise<void> {
  await lib.sql('UPDATE users SET role = :role WHERE login = :login', { role, login });
}
