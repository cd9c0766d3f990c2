import { DOCUMENT } from '@angular/common';
import { Injectable, inject } from '@angular/core';

/** Leaving the app for another address (the payment provider's page); a seam so tests need not navigate. */
@Injectable({ providedIn: 'root' })
export class BrowserLocation {
  private readonly document = inject(DOCUMENT);

  assign(url: string): void {
    this.document.location.assign(url);
  }
}
