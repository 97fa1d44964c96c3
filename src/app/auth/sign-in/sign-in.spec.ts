import { HttpErrorResponse } from '@angular/common/http';
import { provideZonelessChangeDetection } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter, Router } from '@angular/router';
import { of, throwError } from 'rxjs';
import { AuthService } from '../../core/auth/auth.service';
import { sessionAs } from '../../../testing/sessions';
import { SignIn } from './sign-in';

describe('SignIn', () => {
  let fixture: ComponentFixture<SignIn>;
  let signIn: ReturnType<typeof vi.fn>;

  beforeEach(async () => {
    signIn = vi.fn(() => of(sessionAs('engineer')));
    TestBed.configureTestingModule({
      imports: [SignIn],
      providers: [provideZonelessChangeDetection(), provideRouter([]), { provide: AuthService, useValue: { signIn } }],
    });
    fixture = TestBed.createComponent(SignIn);
    await fixture.whenStable();
  });

  const el = () => fixture.nativeElement as HTMLElement;
  const input = (name: string) => el().querySelector<HTMLInputElement>(`input[formcontrolname="${name}"]`)!;
  function type(name: string, value: string) {
    input(name).value = value;
    input(name).dispatchEvent(new Event('input'));
    input(name).dispatchEvent(new Event('blur'));
  }
  async function submit() {
    el().querySelector('form')!.dispatchEvent(new Event('submit'));
    fixture.detectChanges();
    await fixture.whenStable();
  }
  const errors = () => Array.from(el().querySelectorAll('mat-error')).map((e) => e.textContent?.trim());

  it('shows the schema’s messages beside the fields and does not call the service', async () => {
    await submit();
    expect(errors()).toEqual(['Enter a valid e-mail address.', 'Enter your password.']);
    expect(signIn).not.toHaveBeenCalled();
  });

  it('shows an e-mail error as soon as a malformed address is left', async () => {
    type('email', 'not-an-address');
    fixture.detectChanges();
    await fixture.whenStable();
    expect(errors()).toEqual(['Enter a valid e-mail address.']);
  });

  it('calls the service with the normalised e-mail and goes to the songs', async () => {
    const navigate = vi.spyOn(TestBed.inject(Router), 'navigateByUrl').mockResolvedValue(true);
    type('email', '  Engineer@Tuckline.test ');
    type('password', 'tuckline-demo');
    await submit();
    expect(signIn).toHaveBeenCalledWith({ email: 'engineer@tuckline.test', password: 'tuckline-demo' });
    expect(navigate).toHaveBeenCalledWith('/songs');
  });

  it('shows the server’s message when the credentials are wrong', async () => {
    signIn.mockReturnValue(
      throwError(() => new HttpErrorResponse({
        status: 401,
        error: { error: { code: 'auth.invalid_credentials', message: 'That e-mail and password do not match an account.' } },
      })),
    );
    type('email', 'engineer@tuckline.test');
    type('password', 'wrong-password');
    await submit();
    expect(el().querySelector('[role="alert"]')?.textContent).toContain('That e-mail and password do not match an account.');
  });
});
