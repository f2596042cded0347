/** The messages a local fake SMTP server received, newest last, capped so a long session cannot grow without bound. */
import type { MailboxResponse } from '@shared/runs';

/** One received message. */
export type ReceivedMail = MailboxResponse['messages'][number];

/** An in-memory mailbox. */
export class Mailbox {
  private readonly messages: ReceivedMail[] = [];
  private nextId = 1;
  private readonly waiters = new Set<() => void>();

  constructor(private readonly capacity = 500) {}

  /** Stores a message and wakes anyone waiting. */
  add(message: Omit<ReceivedMail, 'id'>): ReceivedMail {
    const stored = { ...message, id: this.nextId++ };
    this.messages.push(stored);
    if (this.messages.length > this.capacity) this.messages.shift();
    for (const w of this.waiters) w();
    return stored;
  }

  /** Every stored message, oldest first. */
  list(): readonly ReceivedMail[] {
    return [...this.messages];
  }

  /** Resolves with the first message (existing or future) matching `test`; rejects after `timeoutMs`. */
  waitFor(test: (m: ReceivedMail) => boolean, timeoutMs = 10_000): Promise<ReceivedMail> {
    return new Promise((resolve, reject) => {
      const check = (): boolean => {
        const found = this.messages.find(test);
        if (found) {
          this.waiters.delete(onAdd);
          clearTimeout(timer);
          resolve(found);
        }
        return !!found;
      };
      const onAdd = () => void check();
      const timer = setTimeout(() => {
        this.waiters.delete(onAdd);
        reject(new Error(`no matching e-mail within ${timeoutMs} ms`));
      }, timeoutMs);
      this.waiters.add(onAdd);
      check();
    });
  }
}
