/**
 * Tuckline's own line icons (24×24, drawn with a 1.75 px round stroke).
 * Kept as path data so they ship in the bundle: no icon font, no CDN.
 */
export const icons = {
  menu: 'M4 7h16M4 12h16M4 17h16',
  songs: 'M4 12h1.5M8 8v8M12 4.5v15M16 8.5v7M19.5 12H20',
  team: 'M9 11a3 3 0 1 0 0-6 3 3 0 0 0 0 6zM3.5 19c0-3 2.5-5 5.5-5s5.5 2 5.5 5M16.5 11.5a2.5 2.5 0 1 0 0-5M17 14c2.2.3 3.8 1.9 3.8 4.5',
  sun: 'M12 16a4 4 0 1 0 0-8 4 4 0 0 0 0 8zM12 2.5v2M12 19.5v2M2.5 12h2M19.5 12h2M5.3 5.3l1.4 1.4M17.3 17.3l1.4 1.4M5.3 18.7l1.4-1.4M17.3 6.7l1.4-1.4',
  moon: 'M19.5 14.5A7.5 7.5 0 0 1 9.5 4.5a7.5 7.5 0 1 0 10 10z',
  signOut: 'M10 4.5H5.5v15H10M14 8l4 4-4 4M18 12H9',
  add: 'M12 5v14M5 12h14',
  done: 'M12 21a9 9 0 1 0 0-18 9 9 0 0 0 0 18zM8 12.5l2.8 2.8L16.2 9.5',
  attention: 'M12 3.8l9 15.7H3zM12 10v4.2M12 17v.4',
  todo: 'M12 21a9 9 0 1 0 0-18 9 9 0 0 0 0 18zM12 12h.01',
  next: 'M9 6l6 6-6 6',
  back: 'M15 6l-6 6 6 6',
  delete: 'M4.5 7h15M10 7V4.5h4V7M6.5 7l1 12.5h9l1-12.5M10 11v5M14 11v5',
  close: 'M6.5 6.5l11 11M17.5 6.5l-11 11',
  upload: 'M12 15.5V4.5M7.5 9L12 4.5 16.5 9M5 19.5h14',
  search: 'M10.5 17a6.5 6.5 0 1 0 0-13 6.5 6.5 0 0 0 0 13zM15.5 15.5l4.5 4.5',
  tuck: 'M3 8h5.5l2.5 8.5h2L15.5 8H21',
  person: 'M12 11.5a3.5 3.5 0 1 0 0-7 3.5 3.5 0 0 0 0 7zM5 20c0-3.6 3.1-6 7-6s7 2.4 7 6',
  presets: 'M4 6.5h16v11H4zM6.5 10h2l1.5 4h1.5l1.5-4h4.5',
  audit: 'M7 4.5h10v15H7zM10 8.5h4M10 12h4M10 15.5h2.5M4.5 7v10',
  settings: 'M4.5 7h9M17.5 7h2M4.5 12h3M11.5 12h8M4.5 17h7M15.5 17h4M15.5 5v4M9.5 10v4M13.5 15v4',
  edit: 'M5 19l1-4.2L15.8 5a1.6 1.6 0 0 1 2.3 0l.9.9a1.6 1.6 0 0 1 0 2.3L9.2 18zM13.5 7.3l3.2 3.2',
  copy: 'M8.5 8.5h10v11h-10zM5.5 15.5v-11h10',
  download: 'M12 4.5v11M7.5 11l4.5 4.5 4.5-4.5M5 19.5h14',
  more: 'M12 6.5v.01M12 12v.01M12 17.5v.01',
  grid: 'M4.5 4.5h6v6h-6zM13.5 4.5h6v6h-6zM4.5 13.5h6v6h-6zM13.5 13.5h6v6h-6z',
  list: 'M8.5 7h11M8.5 12h11M8.5 17h11M4.5 7h.01M4.5 12h.01M4.5 17h.01',
  mail: 'M4 6.5h16v11H4zM4.5 7l7.5 6 7.5-6',
} as const;

export type IconName = keyof typeof icons;
