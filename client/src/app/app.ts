import { ChangeDetectionStrategy, Component } from '@angular/core';
import { Shell } from './core/shell/shell';

@Component({
  selector: 'rw-root',
  imports: [Shell],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './app.html',
})
export class App {}
