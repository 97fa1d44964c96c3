import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input, signal } from '@angular/core';
import { rxResource, takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { passwordSchema, signInSchema, signUpSchema } from '../../../../shared/schemas/auth';
import { InvitationsApi } from '../../core/api/invitations-api';
import { AuthService } from '../../core/auth/auth.service';
import { fieldError, zodValidator } from '../../core/forms/zod-validator';
import { toApiFailure } from '../../core/http/api-error';
import { Icon } from '../../ui/icon/icon';

/** What the e-mailed invitation link opens; works signed in or not. */
@Component({
  selector: 'tl-invitation-accept',
  imports: [DatePipe, ReactiveFormsModule, RouterLink, MatFormFieldModule, MatInputModule, MatButtonModule, MatProgressBarModule, Icon],
  templateUrl: './invitation-accept.html',
  styleUrls: ['../../auth/auth-page.scss', './invitation-accept.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InvitationAccept {
  private readonly api = inject(InvitationsApi);
  private readonly auth = inject(AuthService);
  private readonly router = inject(Router);
  private readonly destroyRef = inject(DestroyRef);
  private readonly fb = inject(NonNullableFormBuilder);

  /** From the route (`/invitations/:token`). */
  readonly token = input.required<string>();

  protected readonly preview = rxResource({ params: () => this.token(), stream: ({ params: token }) => this.api.preview(token) });
  protected readonly session = this.auth.session;
  protected readonly linkError = computed(() => {
    const err = this.preview.error();
    return err ? toApiFailure(err) : null;
  });
  /** Signed in as the invited address already: one button is enough. */
  protected readonly signedInAsInvitee = computed(() => {
    const p = this.preview.hasValue() ? this.preview.value() : null;
    const user = this.auth.user();
    return !!p && !!user && user.email.toLowerCase() === p.email.toLowerCase();
  });

  protected readonly newAccount = this.fb.group({
    displayName: ['', zodValidator(signUpSchema.shape.displayName)],
    password: ['', zodValidator(passwordSchema)],
  });
  protected readonly existing = this.fb.group({ password: ['', zodValidator(signInSchema.shape.password)] });
  protected readonly busy = signal(false);
  protected readonly formError = signal<string | null>(null);
  protected readonly fieldError = fieldError;

  constructor() {
    this.auth.ensureSession().pipe(takeUntilDestroyed()).subscribe();
  }

  protected createAccount(): void {
    if (this.newAccount.invalid) {
      this.newAccount.markAllAsTouched();
      return;
    }
    this.accept(this.newAccount.getRawValue());
  }

  protected acceptWithPassword(): void {
    if (this.existing.invalid) {
      this.existing.markAllAsTouched();
      return;
    }
    this.accept(this.existing.getRawValue());
  }

  protected acceptSignedIn(): void {
    this.accept({});
  }

  private accept(input: { displayName?: string; password?: string }): void {
    this.formError.set(null);
    this.busy.set(true);
    this.api
      .accept(this.token(), input)
      .pipe(takeUntilDestroyed(this.destroyRef))
      .subscribe({
        next: (body) => {
          this.auth.adopt(body);
          this.auth.chooseTeam(body.joinedTeamId);
          void this.router.navigate(['/songs']);
        },
        error: (err: unknown) => {
          this.busy.set(false);
          const failure = toApiFailure(err);
          if (failure.code === 'invitations.invalid' || failure.code === 'invitations.expired') this.preview.reload();
          this.formError.set(failure.message);
        },
      });
  }
}
