import { z } from 'zod';

/** The four roles of Clearbase, from least to most privileged. */
export const roles = ['customer', 'operator', 'manager', 'admin'] as const;
export const roleSchema = z.enum(roles);
export type Role = z.infer<typeof roleSchema>;

/** Roles that work in the lab (everyone but customers). */
export const staffRoles = ['operator', 'manager', 'admin'] as const satisfies readonly Role[];
