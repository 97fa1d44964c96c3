import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { rxResource, takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTableModule } from '@angular/material/table';
import { MatTooltipModule } from '@angular/material/tooltip';
import { switchMap } from 'rxjs';
import { Member, Role, roles } from '../../../../shared/schemas/team';
import { TeamApi } from '../../core/api/team-api';
import { AuthService } from '../../core/auth/auth.service';
import { toApiFailure } from '../../core/http/api-error';
import { ConfirmDialogData, confirmed } from '../../ui/confirm-dialog/confirm-dialog';
import { Icon } from '../../ui/icon/icon';
import { RoleChip } from '../../ui/role-chip/role-chip';
import { TeamInvitations } from '../team-invitations/team-invitations';

@Component({
  selector: 'tl-team-members',
  imports: [DatePipe, MatTableModule, MatSelectModule, MatFormFieldModule, MatButtonModule, MatProgressBarModule, MatTooltipModule, Icon, RoleChip, TeamInvitations],
  templateUrl: './team-members.html',
  styleUrl: './team-members.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TeamMembers {
  private readonly api = inject(TeamApi);
  private readonly auth = inject(AuthService);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly destroyRef = inject(DestroyRef);

  protected readonly roles = roles;
  protected readonly team = this.auth.team;
  protected readonly me = this.auth.user;
  protected readonly manage = computed(() => this.auth.role() !== null && this.auth.can('manageMembers'));
  protected readonly columns = computed(() =>
    this.manage() ? ['displayName', 'email', 'role', 'joinedAt', 'actions'] : ['displayName', 'email', 'role', 'joinedAt'],
  );
  protected readonly pending = signal<string | null>(null);

  protected readonly members = rxResource({
    params: () => this.team()?.id,
    stream: ({ params: teamId }) => this.api.members(teamId),
  });
  protected readonly errorMessage = computed(() => {
    const err = this.members.error();
    return err ? toApiFailure(err).message : null;
  });

  protected changeRole(member: Member, role: Role): void {
    const team = this.team();
    if (!team || role === member.role) return;
    this.pending.set(member.userId);
    this.api
      .changeRole(team.id, member.userId, role)
      .pipe(takeUntilDestroyed(this.destroyRef))
      .subscribe({
        next: (updated) => {
          this.pending.set(null);
          this.members.update((list) => list?.map((m) => (m.userId === updated.userId ? updated : m)));
          this.snackBar.open(`${updated.displayName} is now ${updated.role === 'owner' ? 'an owner' : `an ${updated.role}`}.`, undefined, { duration: 4000 });
        },
        // The interceptor shows the server's reason (for example, the last owner); put the select back.
        error: () => {
          this.pending.set(null);
          this.members.reload();
        },
      });
  }

  protected remove(member: Member): void {
    const team = this.team();
    if (!team) return;
    const data: ConfirmDialogData = {
      title: `Remove ${member.displayName}?`,
      message: `${member.displayName} (${member.email}) will lose access to ${team.name} and its songs. You can invite them again later.`,
      confirmLabel: 'Remove member',
    };
    confirmed(this.dialog, data)
      .pipe(
        switchMap(() => {
          this.pending.set(member.userId);
          return this.api.remove(team.id, member.userId);
        }),
        takeUntilDestroyed(this.destroyRef),
      )
      .subscribe({
        next: () => {
          this.pending.set(null);
          this.members.update((list) => list?.filter((m) => m.userId !== member.userId));
          this.snackBar.open(`${member.displayName} was removed from the team.`, undefined, { duration: 4000 });
        },
        error: () => this.pending.set(null),
      });
  }
}
