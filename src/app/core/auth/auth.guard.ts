import { inject } from '@angular/core';
import { CanActivateFn, Router } from '@angular/router';
import { map } from 'rxjs';
import { Permission } from '../../../../shared/schemas/team';
import { AuthService } from './auth.service';

/** Signed-in users only; others go to sign-in and come back afterwards. */
export const authGuard: CanActivateFn = (_route, state) => {
  const auth = inject(AuthService);
  const router = inject(Router);
  return auth
    .ensureSession()
    .pipe(map((session) => session !== null || router.createUrlTree(['/sign-in'], { queryParams: { returnUrl: state.url } })));
};

/** Sign-in and sign-up are for signed-out visitors; a signed-in user goes to the songs. */
export const guestGuard: CanActivateFn = () => {
  const auth = inject(AuthService);
  const router = inject(Router);
  return auth.ensureSession().pipe(map((session) => session === null || router.createUrlTree(['/songs'])));
};

/** Routes a role may not use send the user back to the songs list. */
export function permissionGuard(permission: Permission): CanActivateFn {
  return () => {
    const auth = inject(AuthService);
    const router = inject(Router);
    return auth.ensureSession().pipe(map(() => auth.can(permission) || router.createUrlTree(['/songs'])));
  };
}
