import { Injectable, signal } from '@angular/core';

export type ThemeName = 'dark' | 'light';

const storageKey = 'tuckline.theme';

function readStoredTheme(): ThemeName {
  try {
    return localStorage.getItem(storageKey) === 'light' ? 'light' : 'dark';
  } catch {
    // Storage can be blocked (private mode, policies); dark is the default.
    return 'dark';
  }
}

function applyTheme(theme: ThemeName): void {
  document.documentElement.classList.toggle('theme-light', theme === 'light');
}

export function applyStoredTheme(): void {
  applyTheme(readStoredTheme());
}

/** Dark by default; the engineer's choice is kept in localStorage. */
@Injectable({ providedIn: 'root' })
export class ThemeService {
  private readonly current = signal<ThemeName>(readStoredTheme());
  readonly theme = this.current.asReadonly();

  toggle(): void {
    this.set(this.current() === 'dark' ? 'light' : 'dark');
  }

  set(theme: ThemeName): void {
    this.current.set(theme);
    applyTheme(theme);
    try {
      localStorage.setItem(storageKey, theme);
    } catch {
      // The theme still applies for this visit.
    }
  }
}
