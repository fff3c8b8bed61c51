import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';

export interface AreaTile {
  title: string;
  text: string;
  icon: string;
  path?: string;
}

/** A landing page for one area: a heading, a sentence, and a card per task. */
@Component({
  selector: 'sw-area-landing',
  imports: [MatCardModule, MatIconModule, RouterLink],
  template: `
    <section class="sw-page">
      <h1>{{ heading() }}</h1>
      <p class="sw-lead">{{ lead() }}</p>
      <ng-content />
      <div class="sw-cards">
        @for (tile of tiles(); track tile.title) {
          <mat-card appearance="outlined" class="tile">
            <mat-card-header>
              <mat-icon mat-card-avatar [svgIcon]="tile.icon" />
              <mat-card-title>
                @if (tile.path) {
                  <a [routerLink]="tile.path">{{ tile.title }}</a>
                } @else {
                  {{ tile.title }}
                }
              </mat-card-title>
            </mat-card-header>
            <mat-card-content
              ><p>{{ tile.text }}</p></mat-card-content
            >
          </mat-card>
        }
      </div>
    </section>
  `,
  styles: `
    .tile mat-icon {
      color: var(--sw-teal);
      width: 32px;
      height: 32px;
    }
    .tile a {
      color: inherit;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AreaLanding {
  readonly heading = input.required<string>();
  readonly lead = input.required<string>();
  readonly tiles = input.required<AreaTile[]>();
}
