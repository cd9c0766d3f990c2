import { inject } from '@angular/core';
import { type CanActivateFn, Router } from '@angular/router';
import { Session } from './session';

/** Lets signed-in users through; sends everyone else to the sign-in page with the URL they wanted. */
export const authGuard: CanActivateFn = (_route, state) => {
  if (inject(Session).signedIn()) return true;
  return inject(Router).createUrlTree(['/sign-in'], { queryParams: { returnUrl: state.url } });
};
