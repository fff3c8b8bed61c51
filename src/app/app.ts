import { ChangeDetectionStrategy, Component } from '@angular/core';
import { Shell } from './core/shell';

@Component({
  selector: 'sw-root',
  imports: [Shell],
  template: '<sw-shell />',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class App {}
