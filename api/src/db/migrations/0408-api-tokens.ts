/**
 * Personal API tokens (issue 16, item 1). Only the SHA-256 of a secret is stored, so the table
 * never holds anything a script could use; `scopes` is one or more of read, submit, sweep.
 * `last_used_at` is written at most once a minute per token (api/src/api-tokens/api-tokens.service.ts).
 */
import type { Migration } from '../migration';

export const up: Migration = async ({ context: qi }) => {
  await qi.sequelize.query(`
    CREATE TABLE api_tokens (
      id serial PRIMARY KEY,
      user_id integer NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      name varchar(100) NOT NULL,
      secret_sha256 bytea NOT NULL UNIQUE CHECK (octet_length(secret_sha256) = 32),
      scopes text[] NOT NULL CHECK (cardinality(scopes) > 0 AND scopes <@ ARRAY['read', 'submit', 'sweep']::text[]),
      created_at timestamptz NOT NULL DEFAULT now(),
      expires_at timestamptz NOT NULL,
      last_used_at timestamptz,
      revoked_at timestamptz
    )`);
  await qi.sequelize.query('CREATE INDEX api_tokens_user_idx ON api_tokens (user_id, created_at DESC)');
};

export const down: Migration = async ({ context: qi }) => {
  await qi.sequelize.query('DROP TABLE api_tokens');
};
