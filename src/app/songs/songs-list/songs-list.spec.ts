import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { Song } from '../../../../shared/schemas/song';
import { sessionAs, signInAs } from '../../../testing/sessions';
import { SongsList } from './songs-list';

function song(id: string, title: string, bpm: number, hitCount: number | null): Song {
  return {
    id, teamId: 't-salt', title, artistAlias: 'Low Tide', bpm, timeSignature: { beats: 4, beatUnit: 4 }, notes: '',
    createdBy: null, stemCount: 2, hitCount, createdAt: '2026-11-30T10:00:00.000Z', updatedAt: '2026-11-30T10:00:00.000Z',
  };
}

describe('SongsList', () => {
  let fixture: ComponentFixture<SongsList>;
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [SongsList],
      providers: [provideZonelessChangeDetection(), provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpTestingController);
    signInAs(sessionAs('engineer'));
    fixture = TestBed.createComponent(SongsList);
    fixture.detectChanges();
  });

  afterEach(() => http.verify());

  const el = () => fixture.nativeElement as HTMLElement;

  it('asks the server for the first page, newest first, and renders its rows', async () => {
    const req = http.expectOne((r) => r.url === '/api/teams/t-salt/songs');
    expect(req.request.params.get('sort')).toBe('updatedAt');
    expect(req.request.params.get('order')).toBe('desc');
    expect(req.request.params.get('page')).toBe('0');
    expect(req.request.params.get('pageSize')).toBe('25');
    expect(req.request.params.has('q')).toBe(false);
    req.flush({ items: [song('s1', 'Night Ferry', 92, 311), song('s2', 'Copper Rain', 140, null)], total: 2 });
    await fixture.whenStable();

    const rows = Array.from(el().querySelectorAll('tr.song-row'));
    expect(rows.length).toBe(2);
    expect(rows[0].textContent).toContain('Night Ferry');
    expect(rows[0].textContent).toContain('311');
    expect(rows[1].textContent).toContain('Copper Rain');
    expect(rows[1].querySelector('a')?.getAttribute('href')).toBe('/songs/s2');
    expect(el().querySelector('.state.empty')).toBeNull();
  });

  it('says so when the team has no songs', async () => {
    http.expectOne((r) => r.url === '/api/teams/t-salt/songs').flush({ items: [], total: 0 });
    await fixture.whenStable();
    expect(el().querySelectorAll('tr.song-row').length).toBe(0);
    expect(el().querySelector('.state.empty')?.textContent).toContain('No songs in this team yet');
  });

  it('shows the server’s message when loading fails', async () => {
    http
      .expectOne((r) => r.url === '/api/teams/t-salt/songs')
      .flush({ error: { code: 'internal', message: 'The database is not answering.' } }, { status: 500, statusText: 'Server Error' });
    await fixture.whenStable();
    expect(el().querySelector('.state.error')?.textContent).toContain('The database is not answering.');
  });

  it('filters on the server with q', async () => {
    http.expectOne((r) => r.url === '/api/teams/t-salt/songs').flush({ items: [], total: 0 });
    await fixture.whenStable();
    vi.useFakeTimers();
    try {
      const input = el().querySelector<HTMLInputElement>('input[type="search"]')!;
      input.value = 'ferry';
      input.dispatchEvent(new Event('input'));
      TestBed.tick();
      vi.advanceTimersByTime(300);
      TestBed.tick();
    } finally {
      vi.useRealTimers();
    }
    const req = http.expectOne((r) => r.url === '/api/teams/t-salt/songs');
    expect(req.request.params.get('q')).toBe('ferry');
    req.flush({ items: [song('s1', 'Night Ferry', 92, 311)], total: 1 });
  });
});
