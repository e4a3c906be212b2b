import { z } from 'zod';
import { emailSchema, idSchema, personNameSchema } from './fields';
import { roleNeedsOrganization, roleSchema, type Role } from './roles';

const organizationRule = (value: { role?: Role; organizationId?: number | null }, ctx: z.RefinementCtx) => {
  if (value.role === undefined) return;
  const needs = roleNeedsOrganization(value.role);
  if (needs && value.organizationId == null) {
    ctx.addIssue({ code: 'custom', path: ['organizationId'], message: 'Choose the organization this account belongs to.' });
  }
  if (!needs && value.organizationId != null) {
    ctx.addIssue({ code: 'custom', path: ['organizationId'], message: 'Administrators and assessors do not belong to an organization.' });
  }
};

export const userCreateSchema = z
  .strictObject({
    email: emailSchema,
    name: personNameSchema,
    role: roleSchema,
    organizationId: idSchema.nullable().optional(),
  })
  .superRefine(organizationRule);
export type UserCreate = z.infer<typeof userCreateSchema>;

export const userUpdateSchema = z
  .strictObject({
    name: personNameSchema.optional(),
    role: roleSchema.optional(),
    organizationId: idSchema.nullable().optional(),
    active: z.boolean({ error: 'Expected true or false.' }).optional(),
  })
  .refine((v) => Object.keys(v).length > 0, { message: 'Nothing to change.' })
  .superRefine(organizationRule);
export type UserUpdate = z.infer<typeof userUpdateSchema>;

export const USER_SORT_FIELDS = ['email', 'name', 'role', 'createdAt', 'lastSignInAt'] as const;

export const pageQuerySchema = z.strictObject({
  page: z.coerce.number().int().min(1, 'Pages start at 1.').default(1),
  pageSize: z.coerce.number().int().min(1).max(100, 'At most 100 rows a page.').default(20),
  sortOrder: z.enum(['asc', 'desc']).default('asc'),
});

export const userListQuerySchema = pageQuerySchema.extend({
  sortField: z.enum(USER_SORT_FIELDS).default('email'),
  q: z.string().trim().max(100).optional(),
  role: roleSchema.optional(),
  status: z.enum(['active', 'inactive']).optional(),
});
export type UserListQuery = z.infer<typeof userListQuerySchema>;

/** A user as the API returns it: never the password hash. */
export interface PublicUser {
  id: number;
  email: string;
  name: string;
  role: Role;
  organizationId: number | null;
  organizationName: string | null;
  active: boolean;
  lastSignInAt: string | null;
  /** False only for a self-registered employer who has not followed the confirmation link yet. */
  emailConfirmed: boolean;
  createdAt: string;
}

export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}
