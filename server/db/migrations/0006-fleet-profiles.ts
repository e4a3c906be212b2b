import type { Migration } from '../migrate';

/**
 * Fleet profiles: an organization's own drift profile fitted from its calibration runs, the
 * source files it was fitted from (kept byte for byte), the practice trials driven on it, and
 * the profile a practice attempt runs on.
 */
export const fleetProfiles: Migration = {
  name: '0006-fleet-profiles',
  async up({ context: sequelize }) {
    await sequelize.query(`
      CREATE TYPE fleet_profile_status AS ENUM ('active', 'archived');
      CREATE TABLE fleet_profiles (
        id                uuid PRIMARY KEY,
        organization_id   integer NOT NULL REFERENCES organizations(id) ON DELETE RESTRICT,
        name              text NOT NULL CHECK (char_length(name) BETWEEN 1 AND 80),
        status            fleet_profile_status NOT NULL DEFAULT 'active',
        robot             jsonb NOT NULL,
        drift_profile     jsonb NOT NULL,
        umbmark_report    jsonb,
        alpha_fit_report  jsonb,
        created_by        integer REFERENCES users(id) ON DELETE SET NULL,
        created_at        timestamptz NOT NULL DEFAULT now(),
        updated_at        timestamptz NOT NULL DEFAULT now(),
        CHECK (umbmark_report IS NOT NULL OR alpha_fit_report IS NOT NULL)
      );
      CREATE INDEX fleet_profiles_organization_idx ON fleet_profiles (organization_id, created_at DESC);

      CREATE TYPE fleet_file_kind AS ENUM ('umbmark', 'poses');
      CREATE TABLE fleet_profile_files (
        profile_id  uuid NOT NULL REFERENCES fleet_profiles(id) ON DELETE CASCADE,
        kind        fleet_file_kind NOT NULL,
        file_name   text NOT NULL,
        bytes       bytea NOT NULL,
        created_at  timestamptz NOT NULL DEFAULT now(),
        PRIMARY KEY (profile_id, kind)
      );

      CREATE TABLE fleet_practice_trials (
        profile_id  uuid NOT NULL REFERENCES fleet_profiles(id) ON DELETE CASCADE,
        trial_id    text NOT NULL,
        assigned_by integer REFERENCES users(id) ON DELETE SET NULL,
        created_at  timestamptz NOT NULL DEFAULT now(),
        PRIMARY KEY (profile_id, trial_id)
      );

      ALTER TABLE attempts ADD COLUMN fleet_profile_id uuid REFERENCES fleet_profiles(id) ON DELETE RESTRICT;
      ALTER TABLE attempts ADD CONSTRAINT attempts_fleet_practice_only CHECK (fleet_profile_id IS NULL OR mode = 'practice');
      CREATE INDEX attempts_fleet_profile_idx ON attempts (fleet_profile_id) WHERE fleet_profile_id IS NOT NULL;
    `);
  },
  async down({ context: sequelize }) {
    await sequelize.query(`
      ALTER TABLE attempts DROP COLUMN fleet_profile_id;
      DROP TABLE fleet_practice_trials, fleet_profile_files, fleet_profiles;
      DROP TYPE fleet_file_kind, fleet_profile_status;
    `);
  },
};
