/** The four roles of Clearbase, from least to most privileged. */
export const roles = ['customer', 'operator', 'manager', 'admin'] as const;
export type Role = (typeof roles)[number];

/** Roles that work in the lab (everyone but customers). */
export const staffRoles = ['operator', 'manager', 'admin'] as const satisfies readonly Role[];

/** Roles that manage the lab: stock profiles, scanners, prices and staff. */
export const managerRoles = ['manager', 'admin'] as const satisfies readonly Role[];
