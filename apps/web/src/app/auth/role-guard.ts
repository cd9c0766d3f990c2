import { inject } from '@angular/core';
import { type ActivatedRouteSnapshot, type CanActivateFn, Router } from '@angular/router';
import type { Role } from '@clearbase/contracts';
import { Session } from './session';

/** The roles a route allows, from `data: { roles: [...] }` on it or on the nearest parent that sets them. */
export function routeRoles(route: ActivatedRouteSnapshot): readonly Role[] | null {
  for (let r: ActivatedRouteSnapshot | null = route; r; r = r.parent) {
    const roles = r.data['roles'] as readonly Role[] | undefined;
    if (roles) return roles;
  }
  return null;
}

/** Lets a user through when their role is in the route's `data.roles`; otherwise sends them home. */
export const roleGuard: CanActivateFn = (route) => {
  const role = inject(Session).role();
  const allowed = routeRoles(route);
  if (role !== null && (allowed === null || allowed.includes(role))) return true;
  return inject(Router).createUrlTree(role === null ? ['/sign-in'] : ['/']);
};
