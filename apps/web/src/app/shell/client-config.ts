import { HttpClient } from '@angular/common/http';
import { Injectable, computed, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import type { ClientConfig as ClientConfigBody } from '@clearbase/contracts';
import { catchError, of } from 'rxjs';

/** The server's settings the app shapes itself by, read once; until they arrive (or if they fail) all are off. */
@Injectable({ providedIn: 'root' })
export class ClientConfig {
  private readonly settings = toSignal(
    inject(HttpClient)
      .get<ClientConfigBody>('/api/config/client')
      .pipe(catchError(() => of<ClientConfigBody>({ localFakes: false }))),
    { initialValue: { localFakes: false } },
  );

  /** The local mail catcher and payment fake run: the development mailbox exists. */
  readonly localFakes = computed(() => this.settings().localFakes);
}
