import type { Role } from '@clearbase/contracts';
import { addUser, signedIn, type Client, type TestApp } from './test-app';

/**
 * Adds one user of each given role (`<role>@lab.test`) and signs each in.
 * @example const { manager, customer } = await signInRoles(t, ['manager', 'customer']);
 */
export async function signInRoles<R extends Role>(
  t: TestApp,
  roles: readonly R[],
): Promise<Record<R, Client>> {
  const clients = {} as Record<R, Client>;
  for (const role of roles) {
    await addUser(t.db, role);
    clients[role] = await signedIn(t.app, `${role}@lab.test`);
  }
  return clients;
}
