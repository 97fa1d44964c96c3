import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { Role } from '../../../shared/schemas/team';
import { sessionAs, signInAs } from '../../testing/sessions';
import { navItemsFor } from './nav-items';
import { Shell } from './shell';

describe('Shell navigation', () => {
  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [Shell],
      providers: [provideZonelessChangeDetection(), provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
  });

  async function renderAs(role: Role, extraTeams = sessionAs(role).teams.slice(1)) {
    signInAs(sessionAs(role, extraTeams));
    const fixture = TestBed.createComponent(Shell);
    await fixture.whenStable();
    return fixture.nativeElement as HTMLElement;
  }
  const navLabels = (el: HTMLElement) => Array.from(el.querySelectorAll('mat-nav-list a')).map((a) => a.textContent?.trim());

  it('hides Team and the audit trail from an assistant', async () => {
    const el = await renderAs('assistant');
    expect(navLabels(el)).toEqual(['Songs', 'Presets', 'Settings']);
    expect(el.querySelector('tl-role-chip')?.textContent?.trim()).toBe('assistant');
  });

  it('shows Team and the audit trail to an owner', async () => {
    const el = await renderAs('owner');
    expect(navLabels(el)).toEqual(['Songs', 'Presets', 'Team', 'Audit trail', 'Settings']);
  });

  it('offers a team switcher only to members of several teams', async () => {
    const single = await renderAs('engineer');
    expect(single.querySelector('mat-select')).toBeNull();
    expect(single.querySelector('.team-name')?.textContent).toContain('Saltmarsh Sound Room');
  });

  it('lists Team and the audit trail for owners only, Presets for every role', () => {
    expect(navItemsFor('engineer').map((i) => i.label)).toEqual(['Songs', 'Presets', 'Settings']);
    expect(navItemsFor(null).map((i) => i.label)).toEqual(['Songs', 'Presets']);
    expect(navItemsFor('owner').map((i) => i.path)).toEqual(['/songs', '/presets', '/team', '/audit', '/settings']);
  });
});

describe('Shell team switcher', () => {
  it('appears for a member of two teams', async () => {
    TestBed.configureTestingModule({
      imports: [Shell],
      providers: [provideZonelessChangeDetection(), provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    signInAs(sessionAs('engineer', [{ id: 't-dune', name: 'Dune Road Mixes', role: 'owner' }]));
    const fixture = TestBed.createComponent(Shell);
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    expect(el.querySelector('mat-select')).not.toBeNull();
  });
});
