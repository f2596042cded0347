/** The SHA-256 of a registered command template (issue 16, item 4): what a worker pins in WORKER_SOLVERS to approve it. */
import { createHash } from 'node:crypto';

/** Lower-case hex SHA-256 of the command exactly as stored (UTF-8). */
export function commandSha256(command: string): string {
  return createHash('sha256').update(command, 'utf8').digest('hex');
}
