import bcrypt from 'bcryptjs';
import type { Migration } from '../migrate';

export interface DemoOptions {
  password: string;
  bcryptCost: number;
}

/** The invented demo organization and one account per role (README lists them). */
export const DEMO_ORGANIZATION = 'Quillmoor Parcel Depot (demo)';
export const DEMO_DOMAIN = 'demo.driftproof.test';
export const DEMO_ACCOUNTS = [
  { email: `admin@${DEMO_DOMAIN}`, name: 'Rowan Tallis', role: 'admin', inOrganization: false },
  { email: `employer@${DEMO_DOMAIN}`, name: 'Mira Okafor-Hale', role: 'employer', inOrganization: true },
  { email: `hr@${DEMO_DOMAIN}`, name: 'Jonah Brevik', role: 'hr', inOrganization: true },
  { email: `assessor@${DEMO_DOMAIN}`, name: 'Priya Castellane', role: 'assessor', inOrganization: false },
  { email: `operator1@${DEMO_DOMAIN}`, name: 'Teo Marsh', role: 'operator', inOrganization: true },
  { email: `operator2@${DEMO_DOMAIN}`, name: 'Lena Vireo', role: 'operator', inOrganization: true },
] as const;

export function demoOrganization({ password, bcryptCost }: DemoOptions): Migration {
  return {
    name: '0001-demo-organization',
    async up({ context: sequelize }) {
      const hash = await bcrypt.hash(password, bcryptCost);
      await sequelize.transaction(async (transaction) => {
        const [[org]] = (await sequelize.query('INSERT INTO organizations (name) VALUES (:name) RETURNING id', {
          replacements: { name: DEMO_ORGANIZATION },
          transaction,
        })) as [{ id: number }[], unknown];
        for (const account of DEMO_ACCOUNTS) {
          await sequelize.query(
            `INSERT INTO users (email, name, role, organization_id, password_hash, email_confirmed_at)
             VALUES (:email, :name, :role, :organizationId, :hash, now())`,
            {
              replacements: { ...account, organizationId: account.inOrganization ? org.id : null, hash },
              transaction,
            },
          );
        }
      });
    },
  };
}
