import { bootstrapApplication } from '@angular/platform-browser';
import { App } from './app/app';
import { appConfig } from './app/app.config';
import { applyStoredTheme } from './app/core/theme/theme.service';

// Before the first paint, so a light-theme user never sees a dark flash.
applyStoredTheme();

bootstrapApplication(App, appConfig).catch((err: unknown) => console.error(err));
