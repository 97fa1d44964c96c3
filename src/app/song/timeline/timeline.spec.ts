import { provideZonelessChangeDetection } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HitView } from '../workspace/hit-views';
import { Timeline } from './timeline';

const hit = (index: number, timeSec: number, status: HitView['status']): HitView => ({
  index, id: `h${index}`, number: index + 1, timeSec, strength: 1, enabled: status !== 'off', depthDb: null, origin: 'detected', status,
});

describe('Timeline', () => {
  let fixture: ComponentFixture<Timeline>;

  beforeEach(async () => {
    TestBed.configureTestingModule({ imports: [Timeline], providers: [provideZonelessChangeDetection()] });
    fixture = TestBed.createComponent(Timeline);
    fixture.componentRef.setInput('durationSec', 8);
    fixture.componentRef.setInput('bpm', 120);
    fixture.componentRef.setInput('hits', [hit(0, 0.5, 'tucked'), hit(1, 1, 'off'), hit(2, 1.5, 'gated')]);
    fixture.componentRef.setInput('curves', [
      { laneId: 'l1', name: '808', muted: false, points: [{ timeSec: 0, gainDb: 0 }, { timeSec: 0.5, gainDb: -18 }, { timeSec: 0.6, gainDb: 0 }, { timeSec: 8, gainDb: 0 }], baseGainDb: 0, floorDb: -60, gatedHitIndexes: [2], stampedHitCount: 1 },
    ]);
    await fixture.whenStable();
  });

  const svg = () => (fixture.nativeElement as HTMLElement).querySelector('svg')!;

  it('marks hits as on, off (hollow) and skipped by the gate (dashed), and draws the gain curve', () => {
    expect(svg().querySelectorAll('g.hit.status-tucked').length).toBe(1);
    expect(svg().querySelectorAll('g.hit.status-off').length).toBe(1);
    expect(svg().querySelectorAll('g.hit.status-gated').length).toBe(1);
    expect(svg().querySelector('path.curve')?.getAttribute('d')).toMatch(/^M/);
    expect(Array.from(svg().querySelectorAll('g.ruler text')).map((t) => t.textContent)).toContain('2');
  });

  it('selects a hit on click and toggles it from the keyboard', async () => {
    const picked: number[] = [];
    const toggled: number[] = [];
    fixture.componentInstance.selectHit.subscribe((i) => picked.push(i));
    fixture.componentInstance.toggleHit.subscribe((i) => toggled.push(i));
    svg().querySelectorAll('g.hit')[1].dispatchEvent(new MouseEvent('click', { bubbles: true }));
    expect(picked).toEqual([1]);
    fixture.componentRef.setInput('selectedHit', 1);
    await fixture.whenStable();
    svg().dispatchEvent(new KeyboardEvent('keydown', { key: ' ', bubbles: true }));
    expect(toggled).toEqual([1]);
  });

  it('zooms in with + and back out to the whole song with 0', async () => {
    const label = () => (fixture.nativeElement as HTMLElement).querySelector('.view')!.textContent!.trim();
    expect(label()).toBe('0.00 s – 8.00 s');
    svg().dispatchEvent(new KeyboardEvent('keydown', { key: '+', bubbles: true }));
    await fixture.whenStable();
    expect(label()).toBe('2.00 s – 6.00 s');
    svg().dispatchEvent(new KeyboardEvent('keydown', { key: '0', bubbles: true }));
    await fixture.whenStable();
    expect(label()).toBe('0.00 s – 8.00 s');
  });
});
