import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { Role } from '../../../../shared/schemas/team';
import { presetDto } from '../../../testing/presets';
import { sessionAs, signInAs } from '../../../testing/sessions';
import { PresetsLibrary } from './presets-library';

describe('PresetsLibrary', () => {
  let fixture: ComponentFixture<PresetsLibrary>;
  let http: HttpTestingController;

  async function renderAs(role: Role) {
    TestBed.configureTestingModule({
      imports: [PresetsLibrary],
      providers: [provideZonelessChangeDetection(), provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    localStorage.removeItem('tuckline.presets.view');
    http = TestBed.inject(HttpTestingController);
    signInAs(sessionAs(role));
    fixture = TestBed.createComponent(PresetsLibrary);
    fixture.detectChanges();
    const req = http.expectOne((r) => r.url === '/api/teams/t-salt/presets');
    req.flush([presetDto(), presetDto({ id: 'p-drill', name: 'Drill slide keeper', genre: 'drill', useCount: 0 })]);
    await fixture.whenStable();
    return req.request;
  }

  afterEach(() => http.verify());
  const el = () => fixture.nativeElement as HTMLElement;
  const buttonLabels = () => Array.from(el().querySelectorAll('button')).map((b) => b.textContent?.trim() ?? '');

  it('hides every edit control from an assistant', async () => {
    await renderAs('assistant');
    expect(el().querySelectorAll('tr.preset-row').length).toBe(2);
    expect(buttonLabels().some((l) => l.includes('New preset'))).toBe(false);
    expect(buttonLabels().some((l) => l.includes('Import file'))).toBe(false);
    expect(el().querySelectorAll('button.preset-actions').length).toBe(0);
    // Status is an editor's concern; an assistant sees published presets only.
    expect(Array.from(el().querySelectorAll('th')).map((th) => th.textContent?.trim())).not.toContain('Status');
    // Exporting a published preset is still open to them.
    expect(el().querySelectorAll('a[download]').length).toBe(2);
  });

  it('shows create, import and per-preset actions to an engineer', async () => {
    await renderAs('engineer');
    expect(buttonLabels().some((l) => l.includes('New preset'))).toBe(true);
    expect(buttonLabels().some((l) => l.includes('Import file'))).toBe(true);
    expect(el().querySelectorAll('button.preset-actions').length).toBe(2);
    expect(Array.from(el().querySelectorAll('th')).map((th) => th.textContent?.trim())).toContain('Status');
  });

  it('asks the server to sort by name, then sends the chosen sort and genre', async () => {
    const first = await renderAs('engineer');
    expect(first.params.get('sort')).toBe('name');
    expect(first.params.get('order')).toBe('asc');
    expect(first.params.has('genre')).toBe(false);
    const lib = fixture.componentInstance as unknown as { genre: { set(v: string): void }; onSort(s: { active: string; direction: string }): void };
    lib.genre.set('trap');
    lib.onSort({ active: 'useCount', direction: 'desc' });
    // The resource asks again on the next tick (waiting for stability would wait for this very request).
    TestBed.tick();
    const req = http.expectOne((r) => r.url === '/api/teams/t-salt/presets');
    expect(req.request.params.get('genre')).toBe('trap');
    expect(req.request.params.get('sort')).toBe('useCount');
    expect(req.request.params.get('order')).toBe('desc');
    req.flush([presetDto()]);
    await fixture.whenStable();
    expect(el().querySelectorAll('tr.preset-row').length).toBe(1);
  });

  it('draws each preset’s shape in the card view', async () => {
    await renderAs('assistant');
    (fixture.componentInstance as unknown as { setView(v: string): void }).setView('cards');
    fixture.detectChanges();
    await fixture.whenStable();
    const cards = el().querySelectorAll('.preset-card');
    expect(cards.length).toBe(2);
    expect(cards[0].querySelector('tl-shape-thumbnail path.line')?.getAttribute('d')).toMatch(/^M[\d.]+,[\d.]+L/);
  });

  describe('import', () => {
    const pick = (name: string, text: string) =>
      (fixture.componentInstance as unknown as { importFile(e: Event): Promise<void> }).importFile({
        target: { files: [new File([text], name, { type: 'application/json' })], value: name },
      } as unknown as Event);

    it('shows the server’s reason beside the button when the file is refused', async () => {
      await renderAs('engineer');
      await pick('old.tuckline-presets.json', JSON.stringify({ format: 'tuckline.presets', formatVersion: 9, presets: [] }));
      const req = http.expectOne({ method: 'POST', url: '/api/teams/t-salt/presets/import' });
      expect(req.request.body).toEqual({ format: 'tuckline.presets', formatVersion: 9, presets: [] });
      req.flush(
        { error: { code: 'request.invalid', message: 'formatVersion: Unsupported preset file version (this Tuckline reads version 1).', details: [] } },
        { status: 400, statusText: 'Bad Request' },
      );
      await fixture.whenStable();
      expect(el().querySelector('.import [role="alert"]')?.textContent).toBe('Not imported: formatVersion: Unsupported preset file version (this Tuckline reads version 1).');
    });

    it('refuses a file that is not JSON without asking the server', async () => {
      await renderAs('engineer');
      await pick('notes.json', 'kick on 1 and 3');
      await fixture.whenStable();
      expect(el().querySelector('.import [role="alert"]')?.textContent).toContain('“notes.json” is not a JSON file');
    });
  });
});
