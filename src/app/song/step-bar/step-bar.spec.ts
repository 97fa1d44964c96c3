import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { stepsFor } from '../song-steps';
import { StepBar } from './step-bar';

describe('StepBar', () => {
  beforeEach(() => {
    TestBed.configureTestingModule({ imports: [StepBar], providers: [provideZonelessChangeDetection()] });
  });

  function render(active: 'stems' | 'hits' = 'stems') {
    const fixture = TestBed.createComponent(StepBar);
    fixture.componentRef.setInput('steps', stepsFor({ stemCount: 2, hitCount: null }));
    fixture.componentRef.setInput('active', active);
    fixture.detectChanges();
    return fixture;
  }

  it('shows the five steps in order, each with its state in words', () => {
    const el: HTMLElement = render().nativeElement;
    const buttons = Array.from(el.querySelectorAll('button.step'));
    expect(buttons.map((b) => b.querySelector('.label')?.textContent?.trim())).toEqual(['Stems', 'Hits', 'Tuck', 'Check', 'Export']);
    expect(buttons[0].querySelector('.state')?.textContent).toContain('2 stems');
    expect(buttons[1].querySelector('.state')?.textContent).toContain('Ready to detect');
    expect(buttons.every((b) => b.querySelector('tl-icon') !== null)).toBe(true);
  });

  it('marks the open step and emits the step a user picks', () => {
    const fixture = render('hits');
    const el: HTMLElement = fixture.nativeElement;
    const buttons = el.querySelectorAll<HTMLButtonElement>('button.step');
    expect(buttons[1].getAttribute('aria-current')).toBe('step');
    expect(buttons[0].getAttribute('aria-current')).toBeNull();
    const picked: string[] = [];
    fixture.componentInstance.selectStep.subscribe((id) => picked.push(id));
    buttons[4].click();
    expect(picked).toEqual(['export']);
  });
});
