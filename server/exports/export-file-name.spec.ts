import { describe, expect, it } from 'vitest';
import { exportFileName, slug } from './export-file-name';

describe('export file names', () => {
  it('names the song, lane, format and date', () => {
    const at = new Date('2026-12-01T18:00:00Z');
    expect(exportFileName('Night Ferry', ['808'], 'csv', at)).toBe('night-ferry_808_breakpoints_2026-12-01.csv');
    expect(exportFileName('Night Ferry', ['808', 'Synth bass'], 'midi', at)).toBe('night-ferry_2-lanes_cc_2026-12-01.mid');
    expect(exportFileName('Copper Rain', ['Sub'], 'wav', at)).toBe('copper-rain_sub_tucked_2026-12-01.wav');
  });

  it('keeps only safe characters and never returns an empty name', () => {
    expect(slug('Ñandú / "Riddim" ../..')).toBe('nandu-riddim');
    expect(slug('///')).toBe('untitled');
  });
});
