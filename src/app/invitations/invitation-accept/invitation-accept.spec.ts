import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { InvitationPreview } from '../../../../shared/schemas/invitation';
import { AuthService } from '../../core/auth/auth.service';
import { sessionAs } from '../../../testing/sessions';
import { InvitationAccept } from './invitation-accept';

const preview = (accountExists: boolean): InvitationPreview => ({
  teamName: 'Saltmarsh Sound Room',
  email: 'mara.quay@tuckline.test',
  role: 'assistant',
  invitedBy: 'Demo owner',
  expiresAt: '2026-12-08T10:00:00.000Z',
  accountExists,
});

describe('InvitationAccept', () => {
  let fixture: ComponentFixture<InvitationAccept>;
  let http: HttpTestingController;

  async function open(answer: InvitationPreview | { status: number; code: string; message: string }) {
    TestBed.configureTestingModule({
      imports: [InvitationAccept],
      providers: [provideZonelessChangeDetection(), provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(InvitationAccept);
    fixture.componentRef.setInput('token', 'tok_abcdefghijklmnopqrstuvwxyz');
    fixture.detectChanges();
    http.expectOne('/api/auth/me').flush({ error: { code: 'auth.required', message: 'Sign in first.' } }, { status: 401, statusText: 'Unauthorized' });
    const req = http.expectOne('/api/invitations/tok_abcdefghijklmnopqrstuvwxyz');
    if ('teamName' in answer) req.flush(answer);
    else req.flush({ error: { code: answer.code, message: answer.message } }, { status: answer.status, statusText: 'Error' });
    await fixture.whenStable();
  }

  afterEach(() => http.verify());
  const el = () => fixture.nativeElement as HTMLElement;
  const fields = () => Array.from(el().querySelectorAll('input')).map((i) => i.getAttribute('formcontrolname'));

  it('asks a new address for a name and a password', async () => {
    await open(preview(false));
    expect(el().querySelector('h1')?.textContent).toBe('Join Saltmarsh Sound Room');
    expect(el().querySelector('.facts')?.textContent).toContain('Demo owner');
    expect(el().querySelector('.facts')?.textContent).toContain('assistant');
    expect(fields()).toEqual(['displayName', 'password']);
    expect(el().querySelector('form.new-account')).not.toBeNull();
    expect(el().querySelector('form.existing-account')).toBeNull();
  });

  it('asks an existing account for its password only', async () => {
    await open(preview(true));
    expect(fields()).toEqual(['password']);
    expect(el().querySelector('form.existing-account')).not.toBeNull();
    expect(el().querySelector('form.new-account')).toBeNull();
    expect(el().textContent).toContain('already has a Tuckline account');
  });

  it('creates the account, takes the session and switches to the joined team', async () => {
    await open(preview(false));
    const navigate = vi.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    for (const [name, value] of [['displayName', 'Mara Quay'], ['password', 'low-end-theory-42']]) {
      const input = el().querySelector<HTMLInputElement>(`input[formcontrolname="${name}"]`)!;
      input.value = value;
      input.dispatchEvent(new Event('input'));
    }
    el().querySelector('form')!.dispatchEvent(new Event('submit'));
    fixture.detectChanges();
    const req = http.expectOne({ method: 'POST', url: '/api/invitations/tok_abcdefghijklmnopqrstuvwxyz/accept' });
    expect(req.request.body).toEqual({ displayName: 'Mara Quay', password: 'low-end-theory-42' });
    const joined = { ...sessionAs('assistant', [{ id: 't-dune', name: 'Dune Road Mixes', role: 'owner' }]), joinedTeamId: 't-salt' };
    req.flush(joined);
    await fixture.whenStable();
    const auth = TestBed.inject(AuthService);
    expect(auth.user()?.email).toBe('assistant@tuckline.test');
    expect(auth.team()?.id).toBe('t-salt');
    expect(navigate).toHaveBeenCalledWith(['/songs']);
  });

  it('says plainly when the link was used or revoked', async () => {
    await open({ status: 404, code: 'invitations.invalid', message: 'This invitation link is not valid any more: it was used, revoked or replaced. Ask the team owner for a new one.' });
    expect(el().querySelector('h1')?.textContent).toBe('This invitation cannot be used');
    expect(el().querySelector('[role="alert"]')?.textContent).toContain('not valid any more');
    expect(fields()).toEqual([]);
  });
});
