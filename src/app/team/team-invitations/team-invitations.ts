import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { rxResource, takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormGroupDirective, NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTableModule } from '@angular/material/table';
import { switchMap } from 'rxjs';
import { InvitationDto, invitationCreateSchema } from '../../../../shared/schemas/invitation';
import { Role, roles } from '../../../../shared/schemas/team';
import { InvitationsApi } from '../../core/api/invitations-api';
import { AuthService } from '../../core/auth/auth.service';
import { applyServerIssues, fieldError, zodValidator } from '../../core/forms/zod-validator';
import { toApiFailure } from '../../core/http/api-error';
import { ConfirmDialogData, confirmed } from '../../ui/confirm-dialog/confirm-dialog';
import { Icon } from '../../ui/icon/icon';
import { RoleChip } from '../../ui/role-chip/role-chip';

/** Owners invite people by e-mail and look after the invitations still open. */
@Component({
  selector: 'tl-team-invitations',
  imports: [DatePipe, ReactiveFormsModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatButtonModule, MatTableModule, MatProgressBarModule, Icon, RoleChip],
  templateUrl: './team-invitations.html',
  styleUrl: './team-invitations.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TeamInvitations {
  private readonly api = inject(InvitationsApi);
  private readonly auth = inject(AuthService);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly destroyRef = inject(DestroyRef);

  protected readonly roles = roles;
  protected readonly team = this.auth.team;
  protected readonly columns = ['email', 'role', 'invitedBy', 'expiresAt', 'actions'];
  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', zodValidator(invitationCreateSchema.shape.email)],
    role: ['assistant' as Role, zodValidator(invitationCreateSchema.shape.role)],
  });
  protected readonly sending = signal(false);
  protected readonly formError = signal<string | null>(null);
  protected readonly pending = signal<string | null>(null);
  protected readonly fieldError = fieldError;

  protected readonly invitations = rxResource({
    params: () => this.team()?.id,
    stream: ({ params: teamId }) => this.api.list(teamId),
  });
  protected readonly errorMessage = computed(() => {
    const err = this.invitations.error();
    return err ? toApiFailure(err).message : null;
  });

  protected invite(formDir: FormGroupDirective): void {
    this.formError.set(null);
    const team = this.team();
    const parsed = invitationCreateSchema.safeParse(this.form.getRawValue());
    if (!team) return;
    if (!parsed.success) {
      this.form.markAllAsTouched();
      return;
    }
    this.sending.set(true);
    this.api
      .invite(team.id, parsed.data.email, parsed.data.role)
      .pipe(takeUntilDestroyed(this.destroyRef))
      .subscribe({
        next: (inv) => {
          this.sending.set(false);
          formDir.resetForm({ email: '', role: this.form.controls.role.value });
          this.invitations.update((list) => [inv, ...(list ?? []).filter((i) => i.id !== inv.id)]);
          this.snackBar.open(`Invitation sent to ${inv.email}. The link works for 7 days.`, undefined, { duration: 5000 });
        },
        error: (err: unknown) => {
          this.sending.set(false);
          const failure = toApiFailure(err);
          const rest = applyServerIssues(this.form, failure.issues);
          this.formError.set(failure.issues.length && !rest.length ? null : failure.message);
        },
      });
  }

  protected resend(inv: InvitationDto): void {
    const team = this.team();
    if (!team) return;
    this.pending.set(inv.id);
    this.api
      .resend(team.id, inv.id)
      .pipe(takeUntilDestroyed(this.destroyRef))
      .subscribe({
        next: (fresh) => {
          this.pending.set(null);
          this.invitations.update((list) => list?.map((i) => (i.id === fresh.id ? fresh : i)));
          this.snackBar.open(`Sent again to ${fresh.email}, with a new link; the old one no longer works.`, undefined, { duration: 5000 });
        },
        error: () => this.pending.set(null),
      });
  }

  protected revoke(inv: InvitationDto): void {
    const team = this.team();
    if (!team) return;
    const data: ConfirmDialogData = {
      title: `Revoke the invitation to ${inv.email}?`,
      message: `The link in their e-mail stops working. You can invite ${inv.email} again later.`,
      confirmLabel: 'Revoke invitation',
    };
    confirmed(this.dialog, data)
      .pipe(
        switchMap(() => {
          this.pending.set(inv.id);
          return this.api.revoke(team.id, inv.id);
        }),
        takeUntilDestroyed(this.destroyRef),
      )
      .subscribe({
        next: () => {
          this.pending.set(null);
          this.invitations.update((list) => list?.filter((i) => i.id !== inv.id));
          this.snackBar.open(`The invitation to ${inv.email} is revoked.`, undefined, { duration: 4000 });
        },
        error: () => this.pending.set(null),
      });
  }
}
