import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';

@Component({
  selector: 'rw-not-found-page',
  imports: [RouterLink, MatButtonModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <section class="page-narrow">
      <h1 class="page-title">Nothing on this shelf</h1>
      <p>This page does not exist. Check the address, or start again from your home screen.</p>
      <a mat-flat-button routerLink="/">Go to my home screen</a>
    </section>
  `,
})
export class NotFoundPage {}
