import { ChangeDetectionStrategy, Component, DestroyRef, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { AbstractControl, NonNullableFormBuilder, ReactiveFormsModule, ValidationErrors } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { passwordSchema } from '../../../../shared/schemas/auth';
import { PasswordResetApi } from '../../core/api/password-reset-api';
import { fieldError, zodValidator } from '../../core/forms/zod-validator';
import { toApiFailure } from '../../core/http/api-error';
import { Icon } from '../../ui/icon/icon';

@Component({
  selector: 'tl-reset-confirm',
  imports: [ReactiveFormsModule, RouterLink, MatFormFieldModule, MatInputModule, MatButtonModule, MatProgressBarModule, Icon],
  templateUrl: './reset-confirm.html',
  styleUrl: '../auth-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ResetConfirm {
  private readonly api = inject(PasswordResetApi);
  private readonly router = inject(Router);
  private readonly destroyRef = inject(DestroyRef);

  /** From the route (`/reset-password/:token`). */
  readonly token = input.required<string>();

  protected readonly form = inject(NonNullableFormBuilder).group({
    password: ['', zodValidator(passwordSchema)],
    confirm: ['', (c: AbstractControl): ValidationErrors | null => (c.value === c.parent?.get('password')?.value ? null : { zod: 'The two passwords differ.' })],
  });
  protected readonly busy = signal(false);
  protected readonly formError = signal<string | null>(null);
  /** The link was used, replaced or expired: the page offers to ask for a new one. */
  protected readonly linkGone = signal(false);
  protected readonly fieldError = fieldError;

  constructor() {
    this.form.controls.password.valueChanges.pipe(takeUntilDestroyed()).subscribe(() => this.form.controls.confirm.updateValueAndValidity());
  }

  protected submit(): void {
    this.formError.set(null);
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.api
      .confirm(this.token(), this.form.controls.password.value)
      .pipe(takeUntilDestroyed(this.destroyRef))
      .subscribe({
        next: () => void this.router.navigate(['/sign-in'], { queryParams: { notice: 'password-reset' } }),
        error: (err: unknown) => {
          this.busy.set(false);
          const failure = toApiFailure(err);
          this.linkGone.set(failure.code === 'auth.reset_invalid' || failure.code === 'auth.reset_expired' || (failure.code === 'request.invalid' && failure.issues.some((i) => i.path === 'token')));
          this.formError.set(failure.message);
        },
      });
  }
}
