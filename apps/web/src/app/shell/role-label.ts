import type { Role } from '@clearbase/contracts';

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
