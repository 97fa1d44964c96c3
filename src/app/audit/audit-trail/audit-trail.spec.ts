import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { sessionAs, signInAs } from '../../../testing/sessions';
import { dayBoundary } from '../audit-words';
import { AuditTrail } from './audit-trail';

describe('AuditTrail', () => {
  let fixture: ComponentFixture<AuditTrail>;
  let http: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [AuditTrail],
      providers: [provideZonelessChangeDetection(), provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpTestingController);
    signInAs(sessionAs('owner'));
    fixture = TestBed.createComponent(AuditTrail);
    fixture.detectChanges();
    http.expectOne('/api/teams/t-salt/members').flush([
      { userId: '7f1c2a9e-0000-4000-8000-000000000001', email: 'engineer@tuckline.test', displayName: 'Demo engineer', role: 'engineer', joinedAt: '2026-11-01T00:00:00.000Z' },
    ]);
  });

  afterEach(() => http.verify());
  const el = () => fixture.nativeElement as HTMLElement;
  const trail = () => http.expectOne((r) => r.url === '/api/teams/t-salt/audit');
  async function settle() {
    fixture.detectChanges();
    await fixture.whenStable();
  }

  it('asks for the first page with no filters and shows actions in words', async () => {
    const req = trail();
    expect(req.request.params.keys().sort()).toEqual(['page', 'pageSize']);
    expect(req.request.params.get('page')).toBe('0');
    expect(req.request.params.get('pageSize')).toBe('25');
    req.flush({
      total: 1,
      items: [{ id: 'a1', action: 'preset.saved', actor: { id: 'u1', displayName: 'Demo engineer' }, subjectType: 'preset', subjectId: 'p1', details: { version: 3 }, at: '2026-11-30T12:00:00.000Z' }],
    });
    await settle();
    const row = el().querySelector('tr.audit-row')!;
    expect(row.textContent).toContain('saved preset');
    expect(row.textContent).toContain('version 3');
    expect(row.textContent).toContain('Demo engineer');
  });

  it('sends the action prefix, the person and the day range, from the first page', async () => {
    trail().flush({ total: 120, items: [] });
    await settle();
    const page = fixture.componentInstance as unknown as {
      setFilter(which: string, value: string): void;
      onPage(e: { pageIndex: number; pageSize: number; length: number }): void;
    };
    page.onPage({ pageIndex: 2, pageSize: 50, length: 120 });
    TestBed.tick();
    const second = trail();
    expect(second.request.params.get('page')).toBe('2');
    second.flush({ total: 120, items: [] });
    await settle();
    page.setFilter('action', 'preset.');
    page.setFilter('actorId', '7f1c2a9e-0000-4000-8000-000000000001');
    page.setFilter('fromDay', '2026-11-01');
    page.setFilter('toDay', '2026-11-30');
    TestBed.tick();
    const filtered = trail();
    const params = filtered.request.params;
    expect(params.get('action')).toBe('preset.');
    expect(params.get('actorId')).toBe('7f1c2a9e-0000-4000-8000-000000000001');
    expect(params.get('from')).toBe(dayBoundary('2026-11-01', 'start'));
    expect(params.get('to')).toBe(dayBoundary('2026-11-30', 'end'));
    expect(params.get('page')).toBe('0');
    expect(params.get('pageSize')).toBe('50');
    filtered.flush({ total: 0, items: [] });
    await settle();
    expect(el().querySelector('.state')?.textContent).toContain('Nothing recorded matches these filters.');
  });
});
