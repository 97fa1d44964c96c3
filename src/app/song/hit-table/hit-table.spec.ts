import { provideZonelessChangeDetection } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { HitView } from '../workspace/hit-views';
import { HitChange, HitTable } from './hit-table';

const hit = (index: number, timeSec: number, status: HitView['status'], strength = 0.8): HitView => ({
  index, id: `h${index}`, number: index + 1, timeSec, strength, enabled: status !== 'off', depthDb: null, origin: 'detected', status,
});

describe('HitTable', () => {
  let fixture: ComponentFixture<HitTable>;
  let changes: HitChange[];

  beforeEach(async () => {
    TestBed.configureTestingModule({ imports: [HitTable], providers: [provideZonelessChangeDetection()] });
    fixture = TestBed.createComponent(HitTable);
    fixture.componentRef.setInput('hits', [hit(0, 0.5, 'tucked', 1), hit(1, 1.0, 'off'), hit(2, 1.5, 'gated', 0.3), hit(3, 4.75, 'tucked')]);
    fixture.componentRef.setInput('bpm', 120);
    changes = [];
    fixture.componentInstance.change.subscribe((c) => changes.push(c));
    await fixture.whenStable();
  });

  const rows = () => Array.from((fixture.nativeElement as HTMLElement).querySelectorAll('tr.hit-row'));

  it('lists every hit with time, bar.beat.tick, strength and tuck status', () => {
    expect(rows().length).toBe(4);
    const last = rows()[3].textContent!;
    expect(last).toContain('4.750 s');
    expect(last).toContain('3.2.480'); // 4.75 s at 120 BPM, 4/4, 960 PPQ
    expect(rows()[2].textContent).toContain('Skipped (bass gate)');
    expect(rows()[1].textContent).toContain('Off');
    expect(rows()[0].textContent).toContain('100 %');
  });

  it('turns every picked hit off at once', async () => {
    const boxes = (fixture.nativeElement as HTMLElement).querySelectorAll<HTMLInputElement>('tr.hit-row input[type=checkbox]');
    boxes[0].click();
    boxes[3].click();
    await fixture.whenStable();
    const off = Array.from((fixture.nativeElement as HTMLElement).querySelectorAll<HTMLButtonElement>('button')).find((b) => b.textContent?.trim() === 'Turn off')!;
    expect(off.disabled).toBe(false);
    off.click();
    expect(changes).toEqual([{ ids: ['h0', 'h3'], enabled: false }]);
  });

  it('takes a per-hit depth typed as a positive number as a cut', async () => {
    const depth = (fixture.nativeElement as HTMLElement).querySelectorAll<HTMLInputElement>('input.depth')[1];
    depth.value = '6';
    depth.dispatchEvent(new Event('change'));
    expect(changes).toEqual([{ ids: ['h1'], depthDb: -6 }]);
  });
});
