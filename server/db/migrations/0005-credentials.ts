import type { Migration } from '../migrate';

/** Issued credentials, the signing key, and the renewal reminders sent (each at most once). */
export const credentials: Migration = {
  name: '0005-credentials',
  async up({ context: sequelize }) {
    await sequelize.query(`
      CREATE TABLE credentials (
        id               serial PRIMARY KEY,
        number           text NOT NULL UNIQUE,
        user_id          integer NOT NULL REFERENCES users(id) ON DELETE RESTRICT,
        organization_id  integer REFERENCES organizations(id) ON DELETE RESTRICT,
        level_id         text NOT NULL,
        holder_name      text NOT NULL,
        trials           jsonb NOT NULL,
        issued_at        timestamptz NOT NULL,
        expires_at       timestamptz NOT NULL CHECK (expires_at > issued_at),
        signature        text NOT NULL,
        revoked_at       timestamptz,
        revoked_by       integer REFERENCES users(id) ON DELETE SET NULL,
        revoke_reason    text,
        pdf              bytea,
        created_at       timestamptz NOT NULL DEFAULT now(),
        CHECK ((revoked_at IS NULL) = (revoke_reason IS NULL))
      );
      CREATE INDEX credentials_user_idx ON credentials (user_id);
      CREATE INDEX credentials_organization_idx ON credentials (organization_id, expires_at);
      -- One credential of a level per holder that is neither revoked nor renewed: issuing twice is impossible.
      CREATE UNIQUE INDEX credentials_one_per_level ON credentials (user_id, level_id, issued_at);

      CREATE TABLE credential_reminders (
        credential_id  integer NOT NULL REFERENCES credentials(id) ON DELETE CASCADE,
        days_before    integer NOT NULL,
        sent_at        timestamptz NOT NULL DEFAULT now(),
        PRIMARY KEY (credential_id, days_before)
      );
    `);
  },
};
