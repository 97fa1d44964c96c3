import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatChipsModule } from '@angular/material/chips';
import { Role } from '../../../../shared/schemas/team';

/** The member's role in the current team, as a small read-only chip. */
@Component({
  selector: 'tl-role-chip',
  imports: [MatChipsModule],
  template: `<mat-chip-set aria-label="Your role"><mat-chip [disableRipple]="true" [class]="'role-' + role()">{{ role() }}</mat-chip></mat-chip-set>`,
  styles: `
    mat-chip { text-transform: capitalize; }
    .role-owner { --mat-chip-label-text-color: var(--tl-text-curve); --mat-chip-outline-color: var(--tl-line-curve); }
    .role-engineer { --mat-chip-label-text-color: var(--tl-text-kick); --mat-chip-outline-color: var(--tl-line-kick); }
    .role-assistant { --mat-chip-label-text-color: var(--tl-text); --mat-chip-outline-color: var(--tl-border); }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RoleChip {
  readonly role = input.required<Role>();
}
