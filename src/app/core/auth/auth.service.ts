import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, computed, inject, signal } from '@angular/core';
import { Observable, catchError, map, of, tap } from 'rxjs';
import { Session, SignInRequest, SignUpRequest, TeamMembership, sessionSchema } from '../../../../shared/schemas/auth';
import { Permission, can } from '../../../../shared/schemas/team';
import { INLINE_ERRORS } from '../http/api-error';

const teamKey = 'tuckline.team';

/**
 * Who is signed in and which team they are working in.
 * `session` is `undefined` until the first `GET /api/auth/me` answers, `null` when signed out.
 */
@Injectable({ providedIn: 'root' })
export class AuthService {
  private readonly http = inject(HttpClient);

  private readonly sessionState = signal<Session | null | undefined>(undefined);
  private readonly chosenTeamId = signal<string | null>(readStoredTeam());

  readonly session = this.sessionState.asReadonly();
  readonly user = computed(() => this.sessionState()?.user ?? null);
  readonly teams = computed(() => this.sessionState()?.teams ?? []);
  readonly team = computed<TeamMembership | null>(() => {
    const teams = this.teams();
    return teams.find((t) => t.id === this.chosenTeamId()) ?? teams[0] ?? null;
  });
  readonly role = computed(() => this.team()?.role ?? null);

  /** Whether the current role in the current team may do this (the server checks it again). */
  can(permission: Permission): boolean {
    const role = this.role();
    return role !== null && can(role, permission);
  }

  /** Loads the session once; later calls reuse it. */
  ensureSession(): Observable<Session | null> {
    const known = this.sessionState();
    if (known !== undefined) return of(known);
    return this.refresh();
  }

  signIn(request: SignInRequest): Observable<Session> {
    return this.http
      .post<unknown>('/api/auth/sign-in', request, { context: new HttpContext().set(INLINE_ERRORS, true) })
      .pipe(map((body) => this.accept(body)));
  }

  signUp(request: SignUpRequest): Observable<Session> {
    return this.http
      .post<unknown>('/api/auth/sign-up', request, { context: new HttpContext().set(INLINE_ERRORS, true) })
      .pipe(map((body) => this.accept(body)));
  }

  signOut(): Observable<void> {
    return this.http.post<void>('/api/auth/sign-out', null).pipe(
      catchError(() => of(undefined)),
      tap(() => this.clear()),
      map(() => undefined),
    );
  }

  /** Takes a session the server answered elsewhere (accepting an invitation signs the user in). */
  adopt(body: unknown): Session {
    return this.accept(body);
  }

  /** Loads the session again (after a team was renamed or joined). */
  refresh(): Observable<Session | null> {
    return this.http
      .get<unknown>('/api/auth/me', { context: new HttpContext().set(INLINE_ERRORS, true) })
      .pipe(
        map((body) => sessionSchema.parse(body)),
        catchError(() => of(null)),
        tap((session) => this.sessionState.set(session)),
      );
  }

  /** Forgets the session locally (after a 401 or a sign-out). */
  clear(): void {
    this.sessionState.set(null);
  }

  chooseTeam(teamId: string): void {
    this.chosenTeamId.set(teamId);
    try {
      localStorage.setItem(teamKey, teamId);
    } catch {
      // The choice still holds for this visit.
    }
  }

  private accept(body: unknown): Session {
    const session = sessionSchema.parse(body);
    this.sessionState.set(session);
    return session;
  }
}

function readStoredTeam(): string | null {
  try {
    return localStorage.getItem(teamKey);
  } catch {
    return null;
  }
}
