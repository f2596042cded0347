/** The result type every exhaustive test oracle returns. */

/** An oracle's answer: the optimal SOC with one optimal plan, or proof (by exhaustion) that none exists. */
export type OracleOutcome<P> =
  | { readonly kind: 'solved'; readonly soc: number; readonly plan: P; readonly expanded: number }
  | { readonly kind: 'unsolvable'; readonly expanded: number };

/** Options of every oracle. */
export interface OracleOptions {
  /** Give up (throw OracleLimitError) after this many expanded joint states; default 300 000. */
  readonly maxExpansions?: number;
}

/** The default expansion limit: enough for the tiny instances oracles are meant for, and a few seconds at most. */
export const DEFAULT_MAX_EXPANSIONS = 300_000;
