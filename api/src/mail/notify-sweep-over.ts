/**
 * Sends the sweep-over e-mail at most once: the sweep row is locked (SKIP LOCKED, so a second
 * process just passes) and `notified_at` set in the same transaction that sends, so a failed
 * send leaves it unset for a later attempt and a sent one is never repeated.
 */
import { QueryTypes, type Sequelize } from 'sequelize';
import type { Logger } from 'pino';
import type { RunCounts, SweepStatus } from '@shared/runs';
import type { Mailer } from './mailer';
import { sweepMail } from './sweep-mail';

/** Whether a message was sent (false: nothing to send, e-mail off, no address, or already done). */
export async function notifySweepOver(
  sequelize: Sequelize,
  mailer: Mailer,
  sweepId: number,
  publicUrl: string,
  logger: Logger,
): Promise<boolean> {
  return sequelize.transaction(async (transaction) => {
    const [row] = await sequelize.query<{ name: string; status: SweepStatus; counts: Partial<RunCounts> | null; run_count: number; email: string | null; is_email_on: boolean }>(
      `SELECT s.name, s.status, s.counts, s.run_count, u.email, u.is_email_on
       FROM sweeps s JOIN users u ON u.id = s.owner_id
       WHERE s.id = :sweepId AND s.notified_at IS NULL AND s.status IN ('finished', 'failed', 'cancelled')
       FOR UPDATE OF s SKIP LOCKED`,
      { replacements: { sweepId }, transaction, type: QueryTypes.SELECT },
    );
    if (!row) return false;
    const isWanted = row.is_email_on && !!row.email && row.status !== 'cancelled';
    if (isWanted) {
      await mailer.send(sweepMail({
        to: row.email as string, sweepId, sweepName: row.name, status: row.status, counts: row.counts ?? {}, total: row.run_count, publicUrl,
      }));
      logger.info({ sweepId, to: row.email }, 'sweep e-mail sent');
    }
    await sequelize.query('UPDATE sweeps SET notified_at = now() WHERE id = :sweepId', { replacements: { sweepId }, transaction });
    return isWanted;
  });
}
