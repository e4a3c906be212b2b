import type { Migration } from '../migrate';
import { DEMO_DOMAIN, DEMO_ORGANIZATION } from './0001-demo-organization';

/** Exam seats for the demo organization (granted by the demo admin), so exam drives can be tried. */
export const demoExamSeats: Migration = {
  name: '0002-demo-exam-seats',
  async up({ context: sequelize }) {
    await sequelize.query(
      `INSERT INTO seat_ledger (organization_id, delta, kind, actor_id)
       SELECT o.id, 5, 'grant', a.id FROM organizations o, users a WHERE o.name = :org AND a.email = :admin`,
      { replacements: { org: DEMO_ORGANIZATION, admin: `admin@${DEMO_DOMAIN}` } },
    );
  },
};
