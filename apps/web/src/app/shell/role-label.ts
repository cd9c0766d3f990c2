import type { Role } from '@clearbase/contracts';

// Written out in the contracts' order, least to most privileged. The Record type makes the compiler refuse a
// missing or unknown role, and keeps the zod runtime (the contracts' schemas) out of the browser bundle.
const labels: Record<Role, string> = {
  customer: 'Customer',
  operator: 'Operator',
  manager: 'Lab manager',
  admin: 'Administrator',
};

/** How a role is named on screen. */
export function roleLabel(role: Role | null): string {
  return role === null ? '' : labels[role];
}

/** Every role, least to most privileged, for pickers. */
export const roleChoices = Object.keys(labels) as readonly Role[];
