/**
 * WCAG 2.x contrast, as defined in WCAG 2.2 §"relative luminance" and §"contrast ratio"
 * (https://www.w3.org/TR/WCAG22/#dfn-relative-luminance, #dfn-contrast-ratio):
 *   channel c in 0..1 → c ≤ 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055)^2.4
 *   L = 0.2126 R + 0.7152 G + 0.0722 B
 *   ratio = (L_lighter + 0.05) / (L_darker + 0.05)
 */
export function relativeLuminance(hex: string): number {
  const [r, g, b] = parseHex(hex).map((c) => {
    const v = c / 255;
    return v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4;
  });
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}

export function contrastRatio(foreground: string, background: string): number {
  const a = relativeLuminance(foreground);
  const b = relativeLuminance(background);
  return (Math.max(a, b) + 0.05) / (Math.min(a, b) + 0.05);
}

function parseHex(hex: string): [number, number, number] {
  const m = /^#([0-9a-f]{6})$/i.exec(hex.trim());
  if (!m) throw new Error(`Not a #rrggbb colour: ${hex}`);
  const n = parseInt(m[1], 16);
  return [(n >> 16) & 255, (n >> 8) & 255, n & 255];
}

/** Reads `--tl-name: #rrggbb;` declarations out of one `@mixin name { … }` block of the tokens file. */
export function readTokenBlock(scss: string, mixin: string): Record<string, string> {
  const block = new RegExp(`@mixin ${mixin}\\s*\\{([^}]*)\\}`).exec(scss);
  if (!block) throw new Error(`No @mixin ${mixin} in the tokens file`);
  const tokens: Record<string, string> = {};
  for (const m of block[1].matchAll(/--tl-([a-z0-9-]+):\s*([^;]+);/g)) tokens[m[1]] = m[2].trim();
  return tokens;
}
