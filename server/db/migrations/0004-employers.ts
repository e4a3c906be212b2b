import type { Migration } from '../migrate';

/**
 * Employers: confirmed e-mail addresses, organization profiles, seat pricing, the append-only
 * seat ledger (replacing per-operator seat grants), paid orders, processed payment events and
 * level assignments.
 */
export const employers: Migration = {
  name: '0004-employers',
  async up({ context: sequelize }) {
    await sequelize.query(`ALTER TYPE password_token_purpose ADD VALUE IF NOT EXISTS 'email_confirmation'`);
    await sequelize.query(`
      ALTER TABLE users ADD COLUMN email_confirmed_at timestamptz;
      UPDATE users SET email_confirmed_at = created_at;

      ALTER TABLE organizations
        ADD COLUMN billing_email text CHECK (billing_email IS NULL OR length(billing_email) <= 254),
        ADD COLUMN address text CHECK (address IS NULL OR length(address) <= 500);

      CREATE TABLE settings (
        key         text PRIMARY KEY,
        value       jsonb NOT NULL,
        updated_at  timestamptz NOT NULL DEFAULT now()
      );
      INSERT INTO settings (key, value) VALUES
        ('seat_pricing', '{"currency": "eur", "unitAmount": 4900, "tiers": [{"minQuantity": 10, "unitAmount": 4400}, {"minQuantity": 50, "unitAmount": 3900}]}');

      CREATE TYPE seat_order_status AS ENUM ('pending', 'paid', 'expired', 'refunded', 'partially_refunded');
      CREATE TABLE seat_orders (
        id                  uuid PRIMARY KEY,
        organization_id     integer NOT NULL REFERENCES organizations(id) ON DELETE RESTRICT,
        created_by          integer REFERENCES users(id) ON DELETE SET NULL,
        quantity            integer NOT NULL CHECK (quantity BETWEEN 1 AND 1000),
        unit_amount         integer NOT NULL CHECK (unit_amount > 0),
        amount_total        integer NOT NULL CHECK (amount_total = unit_amount * quantity),
        currency            text NOT NULL,
        status              seat_order_status NOT NULL DEFAULT 'pending',
        checkout_session_id text UNIQUE,
        payment_intent_id   text,
        refunded_quantity   integer NOT NULL DEFAULT 0 CHECK (refunded_quantity BETWEEN 0 AND quantity),
        paid_at             timestamptz,
        created_at          timestamptz NOT NULL DEFAULT now(),
        updated_at          timestamptz NOT NULL DEFAULT now()
      );
      CREATE INDEX seat_orders_organization_idx ON seat_orders (organization_id, created_at DESC);

      CREATE TABLE payment_events (
        id           text PRIMARY KEY,
        type         text NOT NULL,
        received_at  timestamptz NOT NULL DEFAULT now()
      );

      CREATE TYPE seat_entry_kind AS ENUM ('purchase', 'grant', 'exam_start', 'void_return', 'refund');
      CREATE TABLE seat_ledger (
        id               bigserial PRIMARY KEY,
        organization_id  integer NOT NULL REFERENCES organizations(id) ON DELETE RESTRICT,
        delta            integer NOT NULL CHECK (delta <> 0),
        kind             seat_entry_kind NOT NULL,
        order_id         uuid REFERENCES seat_orders(id) ON DELETE RESTRICT,
        attempt_id       uuid REFERENCES attempts(id) ON DELETE RESTRICT,
        actor_id         integer REFERENCES users(id) ON DELETE SET NULL,
        created_at       timestamptz NOT NULL DEFAULT now()
      );
      CREATE INDEX seat_ledger_organization_idx ON seat_ledger (organization_id);
      CREATE UNIQUE INDEX seat_ledger_one_start_per_attempt ON seat_ledger (attempt_id) WHERE kind = 'exam_start';
      CREATE UNIQUE INDEX seat_ledger_one_return_per_attempt ON seat_ledger (attempt_id) WHERE kind = 'void_return';
      CREATE UNIQUE INDEX seat_ledger_one_purchase_per_order ON seat_ledger (order_id) WHERE kind = 'purchase';
      CREATE FUNCTION seat_ledger_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        RAISE EXCEPTION 'seat_ledger is append-only';
      END $$;
      CREATE TRIGGER seat_ledger_no_change BEFORE UPDATE OR DELETE ON seat_ledger
        FOR EACH ROW EXECUTE FUNCTION seat_ledger_append_only();

      -- Seats granted to operators so far become their organization's.
      INSERT INTO seat_ledger (organization_id, delta, kind, actor_id, created_at)
        SELECT u.organization_id, count(*), 'grant', min(g.granted_by), min(g.created_at)
        FROM exam_seat_grants g JOIN users u ON u.id = g.user_id
        WHERE u.organization_id IS NOT NULL GROUP BY u.organization_id;
      INSERT INTO seat_ledger (organization_id, delta, kind, attempt_id, created_at)
        SELECT a.organization_id, -1, 'exam_start', a.id, a.created_at
        FROM exam_seat_grants g JOIN attempts a ON a.id = g.attempt_id WHERE a.organization_id IS NOT NULL;
      DROP TABLE exam_seat_grants;

      CREATE TABLE level_assignments (
        user_id      integer NOT NULL REFERENCES users(id) ON DELETE CASCADE,
        level_id     text NOT NULL,
        assigned_by  integer REFERENCES users(id) ON DELETE SET NULL,
        created_at   timestamptz NOT NULL DEFAULT now(),
        PRIMARY KEY (user_id, level_id)
      );
    `);
  },
};
