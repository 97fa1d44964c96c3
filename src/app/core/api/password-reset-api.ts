import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import { INLINE_ERRORS } from '../http/api-error';

const inline = () => ({ context: new HttpContext().set(INLINE_ERRORS, true) });

/** Password reset by e-mail; the forms show every answer themselves. */
@Injectable({ providedIn: 'root' })
export class PasswordResetApi {
  private readonly http = inject(HttpClient);

  request(email: string): Observable<{ ok: true; message: string }> {
    return this.http.post<{ ok: true; message: string }>('/api/auth/password-reset', { email }, inline());
  }

  confirm(token: string, password: string): Observable<{ ok: true }> {
    return this.http.post<{ ok: true }>('/api/auth/password-reset/confirm', { token, password }, inline());
  }
}
