/**
 * A private PostgreSQL 15 cluster on loopback, for `npm start` (a persistent cluster under
 * .data/postgres) and for the tests (a throwaway cluster in a temporary folder).
 *
 * Debian's initdb and pg_ctl refuse to run as root, so when we are root the data folder is
 * handed to the `postgres` system user and the binaries run through `runuser`.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { chownSync, existsSync, mkdirSync, readdirSync } from 'node:fs';
import { userInfo } from 'node:os';
import { join } from 'node:path';

/** A running cluster and how to reach and stop it. */
export interface PgCluster {
  readonly dataDir: string;
  readonly port: number;
  /** Connection URL of the `postgres` maintenance database. */
  readonly adminUrl: string;
  /** Connection URL of a database in this cluster. */
  urlFor(database: string): string;
  stop(): void;
}

const PG_VERSIONS = ['17', '16', '15'];

/** The folder holding initdb/pg_ctl, installing Debian's postgresql when none is present. */
export function findPgBin(log: (msg: string) => void = console.error): string {
  const found = locate();
  if (found) return found;
  log('PostgreSQL binaries not found; installing Debian package "postgresql" with apt-get…');
  if (userInfo().uid !== 0) {
    throw new Error('PostgreSQL is not installed and we are not root: run "sudo apt-get install -y postgresql" or set DATABASE_URL.');
  }
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  const update = spawnSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
  const install = spawnSync('apt-get', ['install', '-y', '-qq', 'postgresql'], { stdio: 'inherit', env });
  const again = locate();
  if (update.status !== 0 || install.status !== 0 || !again) {
    throw new Error('Could not install PostgreSQL with apt-get. Install the "postgresql" package by hand or set DATABASE_URL.');
  }
  return again;
}

function locate(): string | undefined {
  for (const v of PG_VERSIONS) {
    const dir = `/usr/lib/postgresql/${v}/bin`;
    if (existsSync(join(dir, 'initdb')) && existsSync(join(dir, 'pg_ctl'))) return dir;
  }
  return undefined;
}

function isRoot(): boolean {
  return userInfo().uid === 0;
}

/** Runs a PostgreSQL binary, as the postgres system user when we are root. */
function runPg(bin: string, args: string[], quiet = true): void {
  const [cmd, argv] = isRoot() ? ['runuser', ['-u', 'postgres', '--', bin, ...args]] : [bin, args];
  execFileSync(cmd, argv, { stdio: quiet ? ['ignore', 'ignore', 'pipe'] : 'inherit' });
}

/**
 * Starts (creating on first use) a cluster in `dataDir` listening on 127.0.0.1:`port` with
 * trust authentication for the local `postgres` role. The socket lives in /tmp.
 */
export function startCluster(
  dataDir: string,
  port: number,
  opts: { readonly isThrowaway?: boolean; readonly log?: (msg: string) => void } = {},
): PgCluster {
  const log = opts.log ?? console.error;
  const bin = findPgBin(log);
  mkdirSync(dataDir, { recursive: true });
  if (isRoot()) {
    chownSync(dataDir, postgresUid(), postgresGid());
    const reachable = spawnSync('runuser', ['-u', 'postgres', '--', 'test', '-w', dataDir]).status === 0;
    if (!reachable) throw new Error(`The postgres system user cannot write ${dataDir}: make its parent folders traversable (chmod o+x).`);
  }
  if (readdirSync(dataDir).length === 0) {
    log(`Creating PostgreSQL cluster in ${dataDir}`);
    runPg(join(bin, 'initdb'), ['-D', dataDir, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8']);
  }
  const status = spawnSync(isRoot() ? 'runuser' : join(bin, 'pg_ctl'),
    isRoot() ? ['-u', 'postgres', '--', join(bin, 'pg_ctl'), '-D', dataDir, 'status'] : ['-D', dataDir, 'status'],
    { stdio: 'ignore' });
  if (status.status !== 0) {
    runPg(join(bin, 'pg_ctl'), [
      '-D', dataDir, '-l', join(dataDir, 'server.log'), '-w', '-t', '60',
      // A throwaway test cluster trades durability for speed; the npm start cluster keeps fsync on.
      '-o', `-k /tmp -p ${port} -c listen_addresses=127.0.0.1 -c max_connections=200${opts.isThrowaway ? ' -c fsync=off -c synchronous_commit=off -c full_page_writes=off' : ''}`,
      'start',
    ]);
  }
  const urlFor = (database: string) => `postgres://postgres@127.0.0.1:${port}/${database}`;
  return {
    dataDir,
    port,
    adminUrl: urlFor('postgres'),
    urlFor,
    stop: () => runPg(join(bin, 'pg_ctl'), ['-D', dataDir, '-m', 'fast', '-w', 'stop']),
  };
}

function postgresUid(): number {
  return Number(execFileSync('id', ['-u', 'postgres']).toString().trim());
}

function postgresGid(): number {
  return Number(execFileSync('id', ['-g', 'postgres']).toString().trim());
}
