import tokensScss from './_tokens.scss' with { loader: 'text' };
import { contrastRatio, readTokenBlock, relativeLuminance } from './contrast';

describe('WCAG 2.x contrast helpers', () => {
  it('gives the reference luminances and the 21:1 extreme', () => {
    expect(relativeLuminance('#000000')).toBe(0);
    expect(relativeLuminance('#ffffff')).toBeCloseTo(1, 10);
    expect(contrastRatio('#ffffff', '#000000')).toBeCloseTo(21, 10);
    // #777777 on white is the well-known just-below-AA grey (4.48:1).
    expect(contrastRatio('#777777', '#ffffff')).toBeCloseTo(4.48, 2);
    expect(contrastRatio('#767676', '#ffffff')).toBeGreaterThanOrEqual(4.5);
  });

  it('is symmetric', () => {
    expect(contrastRatio('#2ddbe0', '#0d141a')).toBeCloseTo(contrastRatio('#0d141a', '#2ddbe0'), 12);
  });
});

for (const theme of ['dark', 'light'] as const) {
  describe(`${theme} theme tokens`, () => {
    const tokens = readTokenBlock(tokensScss, theme);
    const textTokens = Object.keys(tokens).filter((k) => k.startsWith('text'));
    const lineTokens = Object.keys(tokens).filter((k) => k.startsWith('line'));

    it('declares the text and line colours the views use', () => {
      for (const name of ['text', 'text-muted', 'text-kick', 'text-bass', 'text-curve', 'text-error']) expect(textTokens).toContain(name);
      for (const name of ['line-kick', 'line-bass', 'line-curve', 'line-hit-off', 'line-hit-gated']) expect(lineTokens).toContain(name);
    });

    // WCAG 2.2 SC 1.4.3: normal text needs at least 4.5:1.
    for (const name of textTokens) {
      for (const bg of ['bg', 'surface', 'surface-raised']) {
        it(`--tl-${name} on --tl-${bg} reaches 4.5:1`, () => {
          expect(contrastRatio(tokens[name], tokens[bg])).toBeGreaterThanOrEqual(4.5);
        });
      }
    }

    // WCAG 2.2 SC 1.4.11: graphical objects (curves, markers, waveforms' outlines) need at least 3:1.
    for (const name of lineTokens) {
      for (const bg of ['bg', 'surface']) {
        it(`--tl-${name} on --tl-${bg} reaches 3:1`, () => {
          expect(contrastRatio(tokens[name], tokens[bg])).toBeGreaterThanOrEqual(3);
        });
      }
    }
  });
}
