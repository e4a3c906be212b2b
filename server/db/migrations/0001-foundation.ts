import type { Migration } from '../migrate';

/** Organizations, users, one-time password tokens, captured mail, sessions and rate-limit counters. */
export const foundation: Migration = {
  name: '0001-foundation',
  async up({ context: sequelize }) {
    await sequelize.query(`
      CREATE TABLE organizations (
        id          serial PRIMARY KEY,
        name        text NOT NULL CHECK (length(name) BETWEEN 1 AND 200),
        created_at  timestamptz NOT NULL DEFAULT now(),
        updated_at  timestamptz NOT NULL DEFAULT now()
      );
      CREATE UNIQUE INDEX organizations_name_key ON organizations (lower(name));

      CREATE TYPE user_role AS ENUM ('admin', 'employer', 'operator', 'assessor', 'hr');
      CREATE TABLE users (
        id               serial PRIMARY KEY,
        email            text NOT NULL UNIQUE CHECK (email = lower(email) AND length(email) <= 254),
        name             text NOT NULL CHECK (length(name) BETWEEN 1 AND 120),
        role             user_role NOT NULL,
        organization_id  integer REFERENCES organizations(id) ON DELETE RESTRICT,
        password_hash    text,
        active           boolean NOT NULL DEFAULT true,
        last_sign_in_at  timestamptz,
        created_at       timestamptz NOT NULL DEFAULT now(),
        updated_at       timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT users_organization_by_role CHECK (
          (role IN ('employer', 'operator', 'hr')) = (organization_id IS NOT NULL)
        )
      );
      CREATE INDEX users_organization_idx ON users (organization_id);

      CREATE TYPE password_token_purpose AS ENUM ('reset', 'invitation');
      CREATE TABLE password_tokens (
        id          serial PRIMARY KEY,
        user_id     integer NOT NULL REFERENCES users(id) ON DELETE CASCADE,
        token_hash  text NOT NULL UNIQUE,
        purpose     password_token_purpose NOT NULL,
        expires_at  timestamptz NOT NULL,
        used_at     timestamptz,
        created_at  timestamptz NOT NULL DEFAULT now()
      );
      CREATE INDEX password_tokens_user_idx ON password_tokens (user_id);

      CREATE TABLE mail_messages (
        id           serial PRIMARY KEY,
        message_id   text,
        envelope_from text NOT NULL,
        envelope_to  text NOT NULL,
        from_header  text NOT NULL,
        to_header    text NOT NULL,
        subject      text NOT NULL,
        text_body    text,
        html_body    text,
        size_bytes   integer NOT NULL,
        received_at  timestamptz NOT NULL DEFAULT now()
      );
      CREATE INDEX mail_messages_received_idx ON mail_messages (received_at DESC);

      -- The table connect-pg-simple expects (its table.sql).
      CREATE TABLE session (
        sid    varchar NOT NULL PRIMARY KEY,
        sess   json NOT NULL,
        expire timestamp(6) NOT NULL
      );
      CREATE INDEX session_expire_idx ON session (expire);

      CREATE TABLE rate_limit_hits (
        key       text PRIMARY KEY,
        hits      integer NOT NULL,
        reset_at  timestamptz NOT NULL
      );
    `);
  },
  async down({ context: sequelize }) {
    await sequelize.query(`
      DROP TABLE rate_limit_hits, session, mail_messages, password_tokens, users, organizations;
      DROP TYPE password_token_purpose, user_role;
    `);
  },
};
