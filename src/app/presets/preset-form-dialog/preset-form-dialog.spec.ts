import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { presetDto } from '../../../testing/presets';
import { PresetFormDialog, PresetFormDialogData } from './preset-form-dialog';

describe('PresetFormDialog', () => {
  let fixture: ComponentFixture<PresetFormDialog>;
  let http: HttpTestingController;
  let close: ReturnType<typeof vi.fn>;

  beforeEach(async () => {
    close = vi.fn();
    const data: PresetFormDialogData = { teamId: 't-salt', preset: presetDto({ version: 2 }) };
    TestBed.configureTestingModule({
      imports: [PresetFormDialog],
      providers: [
        provideZonelessChangeDetection(),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MAT_DIALOG_DATA, useValue: data },
        { provide: MatDialogRef, useValue: { close } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(PresetFormDialog);
    await fixture.whenStable();
  });

  afterEach(() => http.verify());
  const el = () => fixture.nativeElement as HTMLElement;
  const input = (selector: string) => el().querySelector<HTMLInputElement>(selector)!;
  function type(selector: string, value: string) {
    input(selector).value = value;
    input(selector).dispatchEvent(new Event('input'));
  }
  async function settle() {
    fixture.detectChanges();
    await fixture.whenStable();
  }
  const button = (label: string) => Array.from(el().querySelectorAll('button')).find((b) => b.textContent?.includes(label));

  it('sends the loaded version with the save', async () => {
    type('input[formcontrolname="name"]', 'Trap 808 deeper');
    el().querySelector('form')!.dispatchEvent(new Event('submit'));
    await settle();
    const req = http.expectOne({ method: 'PATCH', url: '/api/teams/t-salt/presets/p-trap' });
    expect(req.request.body).toMatchObject({ version: 2, name: 'Trap 808 deeper', genre: 'trap' });
    req.flush(presetDto({ version: 3, name: 'Trap 808 deeper' }));
    await settle();
    expect(close).toHaveBeenCalledWith(expect.objectContaining({ version: 3 }));
  });

  it('on 409 says someone saved first, then reloads and re-applies only the fields this person changed', async () => {
    type('input[formcontrolname="name"]', 'Trap 808 deeper');
    el().querySelector('form')!.dispatchEvent(new Event('submit'));
    await settle();
    http.expectOne({ method: 'PATCH', url: '/api/teams/t-salt/presets/p-trap' }).flush(
      { error: { code: 'presets.stale', message: 'Someone saved version 3 of this preset after you opened version 2. Reload it and apply your change again.', details: { currentVersion: 3 } } },
      { status: 409, statusText: 'Conflict' },
    );
    await settle();
    expect(close).not.toHaveBeenCalled();
    const alert = el().querySelector('.stale[role="alert"]');
    expect(alert?.textContent).toContain('Someone saved version 3');
    const reload = button('Reload and re-apply');
    expect(reload).toBeTruthy();
    expect(button('Save as new version')?.disabled).toBe(true);

    reload!.click();
    await settle();
    // The other person changed the notes and the depth; this person changed the name.
    const fresh = presetDto({ version: 3, notes: 'Deeper for the chorus.', shape: { ...presetDto().shape, points: presetDto().shape.points.map((p) => (p.gainDb < 0 ? { ...p, gainDb: -20 } : p)) } });
    http.expectOne({ method: 'GET', url: '/api/teams/t-salt/presets/p-trap' }).flush(fresh);
    await settle();
    expect(el().querySelector('.stale')).toBeNull();
    expect(el().querySelector('.notice')?.textContent).toContain('Loaded version 3. Your changes to name are applied on top');
    expect(input('input[formcontrolname="name"]').value).toBe('Trap 808 deeper');
    expect(el().querySelector<HTMLTextAreaElement>('textarea[formcontrolname="notes"]')!.value).toBe('Deeper for the chorus.');
    expect(input('input[aria-label="Gain of point 2, dB"]').value).toBe('-20');

    el().querySelector('form')!.dispatchEvent(new Event('submit'));
    await settle();
    const again = http.expectOne({ method: 'PATCH', url: '/api/teams/t-salt/presets/p-trap' });
    expect(again.request.body).toMatchObject({ version: 3, name: 'Trap 808 deeper', notes: 'Deeper for the chorus.' });
    again.flush(presetDto({ version: 4 }));
  });

  it('refuses breakpoints that do not rise in time, beside the field, without calling the server', async () => {
    type('input[aria-label="Time of point 3, ms"]', '-10');
    el().querySelector('form')!.dispatchEvent(new Event('submit'));
    await settle();
    expect(Array.from(el().querySelectorAll('mat-error')).map((e) => e.textContent?.trim())).toContain('Breakpoint times must rise strictly from one point to the next.');
  });
});
