// Sign-up waits for the e-mail to be confirmed: the request (with the password's hash) is kept
// here until the link in the confirmation e-mail is used, so answering "check your e-mail" to
// everyone tells nobody whether an address already has an account.
import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
    CREATE TABLE sign_up_requests (
      id uuid PRIMARY KEY,
      email text NOT NULL CHECK (email = lower(email)),
      team_name text NOT NULL CHECK (length(team_name) BETWEEN 1 AND 120),
      name text NOT NULL CHECK (length(name) BETWEEN 1 AND 120),
      password_hash text NOT NULL,
      token_hash text NOT NULL UNIQUE,
      expires_at timestamptz NOT NULL,
      used_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX sign_up_requests_email ON sign_up_requests(email);
    CREATE INDEX invitations_team_pending ON invitations(team_id) WHERE used_at IS NULL;
    CREATE INDEX password_resets_user ON password_resets(user_id);
  `);
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
    DROP TABLE IF EXISTS sign_up_requests;
    DROP INDEX IF EXISTS invitations_team_pending;
    DROP INDEX IF EXISTS password_resets_user;
  `);
};
