import { actionInWords, dayBoundary, detailsSummary } from './audit-words';

describe('audit words', () => {
  it('puts the codes in words, and spells out ones it does not know', () => {
    expect(actionInWords('preset.saved')).toBe('saved preset');
    expect(actionInWords('member.role_changed')).toBe('changed the role of a member');
    expect(actionInWords('lane.preset_applied')).toBe('lane preset applied');
  });

  it('summarises the details of each kind of event', () => {
    expect(detailsSummary({ action: 'member.role_changed', details: { from: 'assistant', to: 'engineer' } })).toBe('assistant → engineer');
    expect(detailsSummary({ action: 'preset.created', details: { name: 'Trap 808 tuck', genre: 'trap' } })).toBe('“Trap 808 tuck” · trap');
    expect(detailsSummary({ action: 'preset.restored', details: { from: 1, version: 4 } })).toBe('version 1 as version 4');
    expect(detailsSummary({ action: 'invitation.sent', details: { email: 'a@b.test', role: 'assistant' } })).toBe('a@b.test · as assistant');
    expect(detailsSummary({ action: 'auth.sign_in', details: {} })).toBe('');
    expect(detailsSummary({ action: 'auth.sign_in', details: null })).toBe('');
  });

  it('turns a local calendar day into the instants that bound it', () => {
    const start = new Date(dayBoundary('2026-03-29', 'start')!);
    const end = new Date(dayBoundary('2026-03-29', 'end')!);
    expect([start.getFullYear(), start.getMonth(), start.getDate(), start.getHours(), start.getMinutes()]).toEqual([2026, 2, 29, 0, 0]);
    expect([end.getDate(), end.getHours(), end.getMinutes(), end.getSeconds()]).toEqual([29, 23, 59, 59]);
    expect(dayBoundary('', 'start')).toBeUndefined();
    expect(dayBoundary('29/03/2026', 'end')).toBeUndefined();
  });
});
