import { AbstractControl, FormGroup, ValidationErrors, ValidatorFn } from '@angular/forms';
import type { z } from 'zod';
import { FieldIssue } from '../http/api-error';

/** Runs one field's shared zod schema as an Angular validator; the error carries zod's message. */
export function zodValidator(schema: z.ZodType): ValidatorFn {
  return (control: AbstractControl): ValidationErrors | null => {
    const result = schema.safeParse(control.value);
    return result.success ? null : { zod: result.error.issues[0]?.message ?? 'Check this value.' };
  };
}

/** The message to show under a field, once the user has touched it. */
export function fieldError(control: AbstractControl | null): string | null {
  if (!control || !control.invalid || !(control.touched || control.dirty)) return null;
  const errors = control.errors ?? {};
  if (typeof errors['zod'] === 'string') return errors['zod'];
  if (typeof errors['server'] === 'string') return errors['server'];
  return 'Check this value.';
}

/** Puts the server's `request.invalid` issues on the matching controls; returns the ones no control matched. */
export function applyServerIssues(form: FormGroup, issues: FieldIssue[]): FieldIssue[] {
  const unmatched: FieldIssue[] = [];
  for (const issue of issues) {
    const control = issue.path ? form.get(issue.path) : null;
    if (control) {
      control.setErrors({ ...(control.errors ?? {}), server: issue.message });
      control.markAsTouched();
    } else {
      unmatched.push(issue);
    }
  }
  return unmatched;
}
