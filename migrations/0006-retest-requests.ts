// Re-test requests (shared/records/retest-request.ts): the engineer asks the crew to measure a
// session, a pose or one reading's slot again; the crew answers from the field. A synced record like
// the others: the team's, versioned, soft-deleted, and stamped with a change cursor for the pull.
import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
    CREATE TABLE retest_requests (
      id uuid PRIMARY KEY,
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      session_id uuid NOT NULL REFERENCES test_sessions(id) ON DELETE CASCADE,
      pose_id uuid REFERENCES poses(id) ON DELETE CASCADE,
      gauge_point_id uuid REFERENCES gauge_points(id),
      axis text CHECK (axis IN ('foreAft', 'lateral', 'vertical')),
      comment text NOT NULL CHECK (length(comment) BETWEEN 1 AND 1000),
      asked_at timestamptz NOT NULL,
      asked_by uuid NOT NULL REFERENCES users(id),
      state text NOT NULL DEFAULT 'open' CHECK (state IN ('open', 'answered', 'closed')),
      answer text NOT NULL DEFAULT '' CHECK (length(answer) <= 2000),
      answered_at timestamptz,
      answered_by uuid REFERENCES users(id),
      closed_at timestamptz,
      closed_by uuid REFERENCES users(id),
      version integer NOT NULL DEFAULT 1,
      change_seq bigint NOT NULL DEFAULT 0,
      deleted_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      CHECK ((gauge_point_id IS NULL) = (axis IS NULL)),
      CHECK (gauge_point_id IS NULL OR pose_id IS NOT NULL),
      CHECK ((answered_at IS NULL) = (answered_by IS NULL)),
      CHECK ((closed_at IS NULL) = (closed_by IS NULL)),
      CHECK (state <> 'answered' OR (length(answer) > 0 AND answered_at IS NOT NULL)),
      CHECK ((state = 'closed') = (closed_at IS NOT NULL))
    );
    CREATE INDEX retest_requests_session ON retest_requests(session_id);
    CREATE INDEX retest_requests_team_change ON retest_requests(team_id, change_seq);
    CREATE TRIGGER retest_requests_stamp BEFORE INSERT OR UPDATE ON retest_requests
      FOR EACH ROW EXECUTE FUNCTION stamp_change_seq();
  `);
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query('DROP TABLE retest_requests;');
};
