import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { RouterOutlet } from '@angular/router';
import { MatIconRegistry } from '@angular/material/icon';

/** The root: a router outlet; the shell and the sign-in page are routes below it. */
@Component({
  selector: 'cb-root',
  imports: [RouterOutlet],
  template: '<router-outlet />',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class App {
  constructor() {
    // Icons come from the bundled symbol font, never from another origin.
    inject(MatIconRegistry).setDefaultFontSetClass('material-symbols-outlined');
  }
}
