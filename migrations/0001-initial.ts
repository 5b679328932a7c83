// The initial schema. Every row carries its team; rows the field client creates use the
// client's UUIDs; editable rows carry `version` for conflict checks and `change_seq`, stamped by
// a trigger from one global sequence, so a client can pull "everything changed since cursor N".
import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

const syncedTables = ['vehicles', 'gauge_points', 'test_sessions', 'poses', 'readings', 'photos', 'envelopes'];

export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
    CREATE SEQUENCE change_seq;

    CREATE FUNCTION stamp_change_seq() RETURNS trigger AS $$
    BEGIN
      NEW.change_seq := nextval('change_seq');
      NEW.updated_at := now();
      RETURN NEW;
    END $$ LANGUAGE plpgsql;

    CREATE TABLE teams (
      id uuid PRIMARY KEY,
      name text NOT NULL CHECK (length(name) BETWEEN 1 AND 120),
      unit_system text NOT NULL DEFAULT 'mm' CHECK (unit_system IN ('mm', 'in')),
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE users (
      id uuid PRIMARY KEY,
      email text NOT NULL UNIQUE CHECK (email = lower(email)),
      name text NOT NULL CHECK (length(name) BETWEEN 1 AND 120),
      password_hash text NOT NULL,
      unit_system text CHECK (unit_system IN ('mm', 'in')),
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE memberships (
      id uuid PRIMARY KEY,
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      role text NOT NULL CHECK (role IN ('admin', 'engineer', 'tester', 'viewer')),
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (team_id, user_id)
    );

    CREATE TABLE user_sessions (
      id text PRIMARY KEY,
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      expires_at timestamptz NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX user_sessions_user ON user_sessions(user_id);

    CREATE TABLE invitations (
      id uuid PRIMARY KEY,
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      email text NOT NULL CHECK (email = lower(email)),
      role text NOT NULL CHECK (role IN ('admin', 'engineer', 'tester', 'viewer')),
      token_hash text NOT NULL UNIQUE,
      invited_by uuid NOT NULL REFERENCES users(id),
      expires_at timestamptz NOT NULL,
      used_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE password_resets (
      id uuid PRIMARY KEY,
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      token_hash text NOT NULL UNIQUE,
      expires_at timestamptz NOT NULL,
      used_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE vehicles (
      id uuid PRIMARY KEY,
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      name text NOT NULL CHECK (length(name) BETWEEN 1 AND 120),
      chassis text NOT NULL DEFAULT '',
      body text NOT NULL DEFAULT '',
      wheelbase_mm double precision NOT NULL CHECK (wheelbase_mm > 0),
      track_front_mm double precision NOT NULL CHECK (track_front_mm > 0),
      track_rear_mm double precision NOT NULL CHECK (track_rear_mm > 0),
      opening jsonb NOT NULL,
      nominal_gap_mm double precision NOT NULL DEFAULT 0 CHECK (nominal_gap_mm >= 0),
      notes text NOT NULL DEFAULT '',
      version integer NOT NULL DEFAULT 1,
      change_seq bigint NOT NULL DEFAULT 0,
      deleted_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE gauge_points (
      id uuid PRIMARY KEY,
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      vehicle_id uuid NOT NULL REFERENCES vehicles(id) ON DELETE CASCADE,
      label text NOT NULL CHECK (length(label) BETWEEN 1 AND 20),
      y_mm double precision NOT NULL,
      z_mm double precision NOT NULL,
      version integer NOT NULL DEFAULT 1,
      change_seq bigint NOT NULL DEFAULT 0,
      deleted_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE UNIQUE INDEX gauge_points_label ON gauge_points(vehicle_id, label) WHERE deleted_at IS NULL;

    CREATE TABLE test_sessions (
      id uuid PRIMARY KEY,
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      vehicle_id uuid NOT NULL REFERENCES vehicles(id),
      title text NOT NULL DEFAULT '',
      tested_on date NOT NULL,
      conditions text NOT NULL DEFAULT '',
      load_state text NOT NULL DEFAULT '',
      tyre_pressures text NOT NULL DEFAULT '',
      crew text NOT NULL DEFAULT '',
      reading_mode text NOT NULL DEFAULT 'gap' CHECK (reading_mode IN ('gap', 'displacement')),
      safety_ack_at timestamptz,
      safety_ack_by uuid REFERENCES users(id),
      notes text NOT NULL DEFAULT '',
      created_by uuid NOT NULL REFERENCES users(id),
      version integer NOT NULL DEFAULT 1,
      change_seq bigint NOT NULL DEFAULT 0,
      deleted_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE poses (
      id uuid PRIMARY KEY,
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      session_id uuid NOT NULL REFERENCES test_sessions(id) ON DELETE CASCADE,
      seq integer NOT NULL CHECK (seq >= 0),
      label text NOT NULL DEFAULT '',
      kind text NOT NULL CHECK (kind IN ('level', 'wheels', 'ramp')),
      lift_fl_mm double precision NOT NULL DEFAULT 0,
      lift_fr_mm double precision NOT NULL DEFAULT 0,
      lift_rl_mm double precision NOT NULL DEFAULT 0,
      lift_rr_mm double precision NOT NULL DEFAULT 0,
      ramp_angle_deg double precision CHECK (ramp_angle_deg > 0 AND ramp_angle_deg < 90),
      ramp_distance_mm double precision CHECK (ramp_distance_mm >= 0),
      notes text NOT NULL DEFAULT '',
      recorded_at timestamptz NOT NULL,
      created_by uuid NOT NULL REFERENCES users(id),
      version integer NOT NULL DEFAULT 1,
      change_seq bigint NOT NULL DEFAULT 0,
      deleted_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX poses_session ON poses(session_id);

    CREATE TABLE readings (
      id uuid PRIMARY KEY,
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      pose_id uuid NOT NULL REFERENCES poses(id) ON DELETE CASCADE,
      gauge_point_id uuid NOT NULL REFERENCES gauge_points(id),
      axis text NOT NULL CHECK (axis IN ('foreAft', 'lateral', 'vertical')),
      value_mm double precision NOT NULL,
      entered_by uuid NOT NULL REFERENCES users(id),
      excluded boolean NOT NULL DEFAULT false,
      exclude_reason text,
      flag_note text,
      version integer NOT NULL DEFAULT 1,
      change_seq bigint NOT NULL DEFAULT 0,
      deleted_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (pose_id, gauge_point_id, axis),
      CHECK (NOT excluded OR length(coalesce(exclude_reason, '')) > 0)
    );

    CREATE TABLE photos (
      id uuid PRIMARY KEY,
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      session_id uuid NOT NULL REFERENCES test_sessions(id) ON DELETE CASCADE,
      pose_id uuid REFERENCES poses(id) ON DELETE SET NULL,
      caption text NOT NULL DEFAULT '',
      stored_name text NOT NULL,
      thumb_name text NOT NULL,
      mime text NOT NULL,
      width integer NOT NULL,
      height integer NOT NULL,
      bytes integer NOT NULL,
      captured_at timestamptz,
      gps_lat double precision,
      gps_lon double precision,
      created_by uuid NOT NULL REFERENCES users(id),
      version integer NOT NULL DEFAULT 1,
      change_seq bigint NOT NULL DEFAULT 0,
      deleted_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE envelopes (
      id uuid PRIMARY KEY,
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      vehicle_id uuid NOT NULL REFERENCES vehicles(id),
      session_id uuid NOT NULL REFERENCES test_sessions(id),
      revision integer NOT NULL DEFAULT 1,
      status text NOT NULL DEFAULT 'draft' CHECK (status IN ('draft', 'signed', 'superseded')),
      params jsonb NOT NULL,
      snapshot jsonb,
      content_hash text,
      signed_by uuid REFERENCES users(id),
      signed_at timestamptz,
      created_by uuid NOT NULL REFERENCES users(id),
      version integer NOT NULL DEFAULT 1,
      change_seq bigint NOT NULL DEFAULT 0,
      deleted_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (session_id, revision),
      CHECK (status = 'draft' OR (snapshot IS NOT NULL AND content_hash IS NOT NULL AND signed_by IS NOT NULL AND signed_at IS NOT NULL))
    );

    CREATE TABLE envelope_sends (
      id uuid PRIMARY KEY,
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      envelope_id uuid NOT NULL REFERENCES envelopes(id) ON DELETE CASCADE,
      to_email text NOT NULL,
      sent_by uuid NOT NULL REFERENCES users(id),
      message_id text,
      created_at timestamptz NOT NULL DEFAULT now()
    );

    -- One history for every change a person makes to a session's records.
    CREATE TABLE history_events (
      id bigserial PRIMARY KEY,
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      session_id uuid REFERENCES test_sessions(id) ON DELETE CASCADE,
      entity text NOT NULL,
      entity_id uuid NOT NULL,
      action text NOT NULL,
      user_id uuid REFERENCES users(id),
      detail jsonb NOT NULL DEFAULT '{}',
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX history_events_session ON history_events(session_id, id);

    -- Sync bookkeeping: the answer to each pushed batch, so a retried batch gets the same answer.
    CREATE TABLE sync_batches (
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      idempotency_key text NOT NULL CHECK (length(idempotency_key) BETWEEN 8 AND 100),
      user_id uuid NOT NULL REFERENCES users(id),
      request_hash text NOT NULL,
      response jsonb NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      PRIMARY KEY (team_id, idempotency_key)
    );

    -- A stale edit keeps both versions here until a person resolves it.
    CREATE TABLE sync_conflicts (
      id uuid PRIMARY KEY,
      team_id uuid NOT NULL REFERENCES teams(id) ON DELETE CASCADE,
      entity text NOT NULL,
      entity_id uuid NOT NULL,
      base_version integer NOT NULL,
      server_version integer NOT NULL,
      client_record jsonb NOT NULL,
      server_record jsonb NOT NULL,
      user_id uuid NOT NULL REFERENCES users(id),
      resolved_at timestamptz,
      resolved_by uuid REFERENCES users(id),
      resolution text,
      change_seq bigint NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
  `);
  for (const t of [...syncedTables, 'sync_conflicts']) {
    await qi.sequelize.query(`
      CREATE INDEX ${t}_team_change ON ${t}(team_id, change_seq);
      CREATE TRIGGER ${t}_stamp BEFORE INSERT OR UPDATE ON ${t}
        FOR EACH ROW EXECUTE FUNCTION stamp_change_seq();
    `);
  }
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
    DROP TABLE IF EXISTS sync_conflicts, sync_batches, history_events, envelope_sends, envelopes,
      photos, readings, poses, test_sessions, gauge_points, vehicles, password_resets, invitations,
      user_sessions, memberships, users, teams CASCADE;
    DROP FUNCTION IF EXISTS stamp_change_seq();
    DROP SEQUENCE IF EXISTS change_seq;
  `);
};
