import type { Migration } from '../migrate';

/** Drive attempts, their append-only log of batches and calls, and admin-granted exam seats. */
export const attempts: Migration = {
  name: '0002-attempts',
  async up({ context: sequelize }) {
    await sequelize.query(`
      CREATE TYPE attempt_mode AS ENUM ('practice', 'exam');
      CREATE TYPE attempt_status AS ENUM ('driving', 'awaiting_call', 'time_up', 'submitted', 'abandoned');
      CREATE TABLE attempts (
        id               uuid PRIMARY KEY,
        user_id          integer NOT NULL REFERENCES users(id) ON DELETE RESTRICT,
        organization_id  integer REFERENCES organizations(id) ON DELETE RESTRICT,
        trial_id         text NOT NULL,
        content_hash     text NOT NULL,
        mode             attempt_mode NOT NULL,
        status           attempt_status NOT NULL DEFAULT 'driving',
        secret_seed      text NOT NULL,
        public_seed      text NOT NULL,
        next_seq         integer NOT NULL DEFAULT 0 CHECK (next_seq >= 0),
        log_length       integer NOT NULL DEFAULT 0 CHECK (log_length >= 0),
        submitted_at     timestamptz,
        created_at       timestamptz NOT NULL DEFAULT now(),
        updated_at       timestamptz NOT NULL DEFAULT now()
      );
      CREATE INDEX attempts_user_idx ON attempts (user_id, created_at DESC);
      CREATE INDEX attempts_organization_idx ON attempts (organization_id, created_at DESC);

      CREATE TYPE attempt_log_kind AS ENUM ('steps', 'call', 'submit', 'abandon');
      CREATE TABLE attempt_log (
        attempt_id  uuid NOT NULL REFERENCES attempts(id) ON DELETE CASCADE,
        entry_no    integer NOT NULL CHECK (entry_no >= 0),
        kind        attempt_log_kind NOT NULL,
        from_seq    integer,
        request     jsonb NOT NULL,
        response    jsonb NOT NULL,
        created_at  timestamptz NOT NULL DEFAULT now(),
        PRIMARY KEY (attempt_id, entry_no)
      );
      CREATE UNIQUE INDEX attempt_log_batch_key ON attempt_log (attempt_id, from_seq) WHERE kind = 'steps';

      CREATE TABLE exam_seat_grants (
        id          serial PRIMARY KEY,
        user_id     integer NOT NULL REFERENCES users(id) ON DELETE CASCADE,
        granted_by  integer REFERENCES users(id) ON DELETE SET NULL,
        attempt_id  uuid UNIQUE REFERENCES attempts(id) ON DELETE SET NULL,
        used_at     timestamptz,
        created_at  timestamptz NOT NULL DEFAULT now()
      );
      CREATE INDEX exam_seat_grants_free_idx ON exam_seat_grants (user_id) WHERE attempt_id IS NULL;
    `);
  },
  async down({ context: sequelize }) {
    await sequelize.query(`
      DROP TABLE exam_seat_grants, attempt_log, attempts;
      DROP TYPE attempt_log_kind, attempt_status, attempt_mode;
    `);
  },
};
