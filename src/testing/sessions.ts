import { HttpTestingController } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { Session } from '../../shared/schemas/auth';
import { Role } from '../../shared/schemas/team';
import { AuthService } from '../app/core/auth/auth.service';

/** A signed-in member of the demo team with the given role. */
export function sessionAs(role: Role, extraTeams: Session['teams'] = []): Session {
  return {
    user: { id: `u-${role}`, email: `${role}@tuckline.test`, displayName: `Demo ${role}` },
    teams: [{ id: 't-salt', name: 'Saltmarsh Sound Room', role }, ...extraTeams],
  };
}

/** Signs the real AuthService in by answering its `GET /api/auth/me`. */
export function signInAs(session: Session): AuthService {
  localStorage.removeItem('tuckline.team');
  const auth = TestBed.inject(AuthService);
  auth.ensureSession().subscribe();
  TestBed.inject(HttpTestingController).expectOne('/api/auth/me').flush(session);
  return auth;
}
