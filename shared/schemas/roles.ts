import { z } from 'zod';

/** The five kinds of account. Employer, HR and operator accounts belong to one organization. */
export const ROLES = ['admin', 'employer', 'operator', 'assessor', 'hr'] as const;
export const roleSchema = z.enum(ROLES, { error: 'Choose one of: admin, employer, operator, assessor, hr.' });
export type Role = z.infer<typeof roleSchema>;

/** Roles whose accounts must belong to an organization. */
export const ORGANIZATION_ROLES: readonly Role[] = ['employer', 'operator', 'hr'];

export function roleNeedsOrganization(role: Role): boolean {
  return ORGANIZATION_ROLES.includes(role);
}

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Administrator',
  employer: 'Employer',
  operator: 'Operator',
  assessor: 'Assessor',
  hr: 'HR',
};
