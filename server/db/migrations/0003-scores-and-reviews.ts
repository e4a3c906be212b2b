import type { Migration } from '../migrate';

/** Scores of submitted attempts, the assessor's review of each, and an append-only audit log. */
export const scoresAndReviews: Migration = {
  name: '0003-scores-and-reviews',
  async up({ context: sequelize }) {
    await sequelize.query(`
      CREATE TYPE review_status AS ENUM ('not_required', 'awaiting', 'in_review', 'confirmed', 'amended', 'voided');
      CREATE TABLE attempt_scores (
        attempt_id     uuid PRIMARY KEY REFERENCES attempts(id) ON DELETE CASCADE,
        version        text NOT NULL,
        result         jsonb NOT NULL,
        total          numeric(5, 1) NOT NULL,
        passed         boolean NOT NULL,
        flagged        boolean NOT NULL,
        review_status  review_status NOT NULL,
        final_result   jsonb,
        final_passed   boolean,
        finalized_at   timestamptz,
        created_at     timestamptz NOT NULL DEFAULT now(),
        updated_at     timestamptz NOT NULL DEFAULT now()
      );
      CREATE INDEX attempt_scores_review_idx ON attempt_scores (review_status, created_at);

      CREATE TYPE review_verdict AS ENUM ('confirm', 'amend', 'void');
      CREATE TABLE attempt_reviews (
        attempt_id   uuid PRIMARY KEY REFERENCES attempts(id) ON DELETE CASCADE,
        assessor_id  integer NOT NULL REFERENCES users(id) ON DELETE RESTRICT,
        claimed_at   timestamptz NOT NULL DEFAULT now(),
        verdict      review_verdict,
        reason       text,
        amendments   jsonb NOT NULL DEFAULT '[]',
        signed_at    timestamptz,
        CHECK ((verdict IS NULL) = (signed_at IS NULL))
      );

      CREATE TABLE review_audit (
        id          bigserial PRIMARY KEY,
        attempt_id  uuid NOT NULL REFERENCES attempts(id) ON DELETE CASCADE,
        actor_id    integer REFERENCES users(id) ON DELETE SET NULL,
        action      text NOT NULL,
        reason      text,
        details     jsonb NOT NULL DEFAULT '{}',
        created_at  timestamptz NOT NULL DEFAULT now()
      );
      CREATE INDEX review_audit_attempt_idx ON review_audit (attempt_id, id);
      -- The audit log is append-only: no row is ever changed or removed.
      CREATE FUNCTION review_audit_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        RAISE EXCEPTION 'review_audit is append-only';
      END $$;
      CREATE TRIGGER review_audit_no_change BEFORE UPDATE OR DELETE ON review_audit
        FOR EACH ROW EXECUTE FUNCTION review_audit_append_only();
    `);
  },
  async down({ context: sequelize }) {
    await sequelize.query(`
      DROP TABLE review_audit, attempt_reviews, attempt_scores;
      DROP FUNCTION review_audit_append_only;
      DROP TYPE review_verdict, review_status;
    `);
  },
};
