import {
  type ApplicationConfig,
  inject,
  provideAppInitializer,
  provideBrowserGlobalErrorListeners,
  provideZonelessChangeDetection,
} from '@angular/core';
import { provideHttpClient, withInterceptors, withXsrfConfiguration } from '@angular/common/http';
import { provideRouter, withComponentInputBinding } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { appRoutes } from './app-routes';
import { apiInterceptor } from './auth/api-interceptor';
import { Session } from './auth/session';
import { xsrfCookieName, xsrfHeaderName } from '@clearbase/contracts/values';

export const appConfig: ApplicationConfig = {
  providers: [
    provideBrowserGlobalErrorListeners(),
    provideZonelessChangeDetection(),
    provideRouter(appRoutes, withComponentInputBinding()),
    provideHttpClient(
      // The server's cookie and header names; these are also Angular's defaults.
      withXsrfConfiguration({ cookieName: xsrfCookieName, headerName: xsrfHeaderName }),
      withInterceptors([apiInterceptor]),
    ),
    // Ask who is signed in before the first route: it also makes the server set the XSRF cookie.
    provideAppInitializer(() => firstValueFrom(inject(Session).load())),
  ],
};
