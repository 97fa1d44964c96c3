import { ChangeDetectionStrategy, Component, DestroyRef, inject, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { ActivatedRoute, Router, RouterLink } from '@angular/router';
import { signInSchema } from '../../../../shared/schemas/auth';
import { AuthService } from '../../core/auth/auth.service';
import { applyServerIssues, fieldError, zodValidator } from '../../core/forms/zod-validator';
import { toApiFailure } from '../../core/http/api-error';
import { Icon } from '../../ui/icon/icon';
import { safeReturnUrl } from '../return-url';

@Component({
  selector: 'tl-sign-in',
  imports: [ReactiveFormsModule, RouterLink, MatFormFieldModule, MatInputModule, MatButtonModule, MatProgressBarModule, Icon],
  templateUrl: './sign-in.html',
  styleUrl: '../auth-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignIn {
  private readonly auth = inject(AuthService);
  private readonly router = inject(Router);
  private readonly route = inject(ActivatedRoute);
  private readonly destroyRef = inject(DestroyRef);

  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', zodValidator(signInSchema.shape.email)],
    password: ['', zodValidator(signInSchema.shape.password)],
  });
  protected readonly busy = signal(false);
  protected readonly formError = signal<string | null>(null);
  protected readonly fieldError = fieldError;
  protected readonly notice = signal(
    this.route.snapshot.queryParamMap.get('notice') === 'password-reset' ? 'Your password is changed. Sign in with the new one.' : null,
  );

  protected submit(): void {
    this.formError.set(null);
    const parsed = signInSchema.safeParse(this.form.getRawValue());
    if (!parsed.success) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.auth
      .signIn(parsed.data)
      .pipe(takeUntilDestroyed(this.destroyRef))
      .subscribe({
        next: () => void this.router.navigateByUrl(safeReturnUrl(this.route.snapshot.queryParamMap.get('returnUrl'))),
        error: (err: unknown) => {
          this.busy.set(false);
          const failure = toApiFailure(err);
          const rest = applyServerIssues(this.form, failure.issues);
          this.formError.set(failure.issues.length && !rest.length ? null : failure.message);
        },
      });
  }
}
