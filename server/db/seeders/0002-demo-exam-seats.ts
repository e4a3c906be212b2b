import type { Migration } from '../migrate';
import { DEMO_DOMAIN } from './0001-demo-organization';

/** Exam seats for the demo operators (granted by the demo admin), so exam drives can be tried. */
export const demoExamSeats: Migration = {
  name: '0002-demo-exam-seats',
  async up({ context: sequelize }) {
    await sequelize.query(
      `INSERT INTO exam_seat_grants (user_id, granted_by)
       SELECT o.id, a.id FROM users o, users a, generate_series(1, CASE o.email WHEN :op1 THEN 3 ELSE 1 END)
       WHERE o.email IN (:op1, :op2) AND a.email = :admin`,
      { replacements: { op1: `operator1@${DEMO_DOMAIN}`, op2: `operator2@${DEMO_DOMAIN}`, admin: `admin@${DEMO_DOMAIN}` } },
    );
  },
};
