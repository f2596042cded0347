/** A running count of bytes against a limit, shared by every file and archive entry of one upload. */

/** Takes bytes until the limit is reached; once refused it stays refused. */
export class ByteBudget {
  private used = 0;
  private isRefused = false;

  constructor(readonly limit: number) {}

  /** Counts `n` more bytes; returns false (and counts nothing) when that would pass the limit. */
  take(n: number): boolean {
    if (this.isRefused || this.used + n > this.limit) {
      this.isRefused = true;
      return false;
    }
    this.used += n;
    return true;
  }

  /** Whether a take() has been refused. */
  get isExhausted(): boolean {
    return this.isRefused;
  }

  /** Bytes counted so far. */
  get usedBytes(): number {
    return this.used;
  }
}
