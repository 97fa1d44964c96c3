import { ChangeDetectionStrategy, Component, DestroyRef, inject, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import { passwordResetRequestSchema } from '../../../../shared/schemas/invitation';
import { PasswordResetApi } from '../../core/api/password-reset-api';
import { fieldError, zodValidator } from '../../core/forms/zod-validator';
import { toApiFailure } from '../../core/http/api-error';
import { Icon } from '../../ui/icon/icon';

/** The same answer whether the address has an account or not (no hint either way). */
export const resetSentMessage = 'If that address has an account, a reset link is on its way.';

@Component({
  selector: 'tl-reset-request',
  imports: [ReactiveFormsModule, RouterLink, MatFormFieldModule, MatInputModule, MatButtonModule, MatProgressBarModule, Icon],
  templateUrl: './reset-request.html',
  styleUrl: '../auth-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ResetRequest {
  private readonly api = inject(PasswordResetApi);
  private readonly destroyRef = inject(DestroyRef);

  protected readonly form = inject(NonNullableFormBuilder).group({ email: ['', zodValidator(passwordResetRequestSchema.shape.email)] });
  protected readonly busy = signal(false);
  protected readonly sent = signal<string | null>(null);
  protected readonly formError = signal<string | null>(null);
  protected readonly fieldError = fieldError;

  protected submit(): void {
    this.formError.set(null);
    const parsed = passwordResetRequestSchema.safeParse(this.form.getRawValue());
    if (!parsed.success) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.api
      .request(parsed.data.email)
      .pipe(takeUntilDestroyed(this.destroyRef))
      .subscribe({
        next: () => {
          this.busy.set(false);
          this.sent.set(resetSentMessage);
        },
        error: (err: unknown) => {
          this.busy.set(false);
          const failure = toApiFailure(err);
          // 429: the server says how to go on (wait a few minutes); anything else is shown as it is.
          this.formError.set(failure.status === 429 ? `${failure.message} Reset links are limited to a few per quarter of an hour.` : failure.message);
        },
      });
  }
}
