/** "Night Ferry" → "night-ferry": ASCII letters and digits only, so every DAW and file system takes it. */
export function slug(text: string, fallback = 'untitled'): string {
  const s = text
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 48);
  return s || fallback;
}

const extensions = { csv: 'csv', midi: 'mid', wav: 'wav' } as const;
const labels = { csv: 'breakpoints', midi: 'cc', wav: 'tucked' } as const;

/** `<song>_<lane>_<format>_<YYYY-MM-DD>.<ext>`, e.g. `night-ferry_808_breakpoints_2026-12-01.csv`. */
export function exportFileName(song: string, lanes: string[], format: keyof typeof extensions, date: Date): string {
  const lanePart = lanes.length === 1 ? slug(lanes[0], 'lane') : `${lanes.length}-lanes`;
  return `${slug(song)}_${lanePart}_${labels[format]}_${date.toISOString().slice(0, 10)}.${extensions[format]}`;
}
