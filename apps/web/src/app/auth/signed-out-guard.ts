import { inject } from '@angular/core';
import { type CanActivateFn, Router } from '@angular/router';
import { Session } from './session';

/** The sign-in page is for signed-out visitors; a signed-in user goes home instead. */
export const signedOutGuard: CanActivateFn = () =>
  inject(Session).signedIn() ? inject(Router).createUrlTree(['/']) : true;
