// Access and abuse limits, kept in PostgreSQL so every app instance sees the same counts:
// - mail_log: every e-mail the app sends (who, to whom, what kind, when, whether it went out);
//   sheet and invitation quotas are counted from it;
// - a workshop's standing: when its first e-mail address was confirmed (a new workshop has small
//   mail quotas until then and until its first sign-off), and whether photos keep their GPS;
// - rate_limits: rate-limiter-flexible's counters (sign-up, password reset, e-mailed links,
//   uploads in flight); sign_in_throttle: failed sign-ins per (account, address) and the growing
//   wait they impose;
// - session ids are stored as their SHA-256 (existing rows are hashed, so signed-in people stay in);
// - sync_batches gets an index on its age, for pruning.
import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
    CREATE TABLE mail_log (
      id uuid PRIMARY KEY,
      team_id uuid REFERENCES teams(id) ON DELETE CASCADE,
      user_id uuid REFERENCES users(id) ON DELETE SET NULL,
      kind text NOT NULL CHECK (kind IN ('sheet', 'invitation', 'sign-up', 'account-exists', 'password-reset', 'password-changed')),
      to_email text NOT NULL,
      subject text NOT NULL,
      status text NOT NULL DEFAULT 'sending' CHECK (status IN ('sending', 'sent', 'failed')),
      message_id text,
      error text,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX mail_log_team ON mail_log(team_id, kind, created_at);
    CREATE INDEX mail_log_user ON mail_log(user_id, kind, created_at);

    ALTER TABLE teams
      ADD COLUMN email_confirmed_at timestamptz,
      ADD COLUMN photo_gps text NOT NULL DEFAULT 'drop' CHECK (photo_gps IN ('keep', 'drop'));
    -- Workshops made before this step were made by people who confirmed their address, and kept
    -- GPS in photos: they keep doing so until an admin changes it.
    UPDATE teams SET email_confirmed_at = created_at, photo_gps = 'keep';

    CREATE TABLE rate_limits (
      key varchar(255) PRIMARY KEY,
      points integer NOT NULL DEFAULT 0,
      expire bigint
    );
    CREATE INDEX rate_limits_expire ON rate_limits(expire);

    CREATE TABLE sign_in_throttle (
      account text NOT NULL,
      address text NOT NULL,
      failures integer NOT NULL DEFAULT 0,
      next_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      PRIMARY KEY (account, address)
    );
    CREATE INDEX sign_in_throttle_address ON sign_in_throttle(address, updated_at);
    CREATE INDEX sign_in_throttle_updated ON sign_in_throttle(updated_at);

    UPDATE user_sessions SET id = encode(sha256(convert_to(id, 'UTF8')), 'hex');

    CREATE INDEX sync_batches_created ON sync_batches(created_at);
  `);
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
    DROP INDEX IF EXISTS sync_batches_created;
    DROP TABLE IF EXISTS sign_in_throttle, rate_limits, mail_log;
    ALTER TABLE teams DROP COLUMN IF EXISTS email_confirmed_at, DROP COLUMN IF EXISTS photo_gps;
  `);
};
