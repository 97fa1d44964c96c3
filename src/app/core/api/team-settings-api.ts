import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import { TeamSettings } from '../../../../shared/schemas/invitation';
import { INLINE_ERRORS } from '../http/api-error';
import { enc } from './songs-api';

export type TeamSettingsDto = TeamSettings & { name: string };
export interface TeamSettingsPatch {
  name?: string;
  defaultExport?: Partial<TeamSettings['defaultExport']>;
  /** `null` clears a genre's default. */
  defaultPresetByGenre?: Record<string, string | null>;
}

/** A team's name, default export options and default preset per genre. */
@Injectable({ providedIn: 'root' })
export class TeamSettingsApi {
  private readonly http = inject(HttpClient);

  get(teamId: string): Observable<TeamSettingsDto> {
    return this.http.get<TeamSettingsDto>(`/api/teams/${enc(teamId)}/settings`);
  }

  save(teamId: string, patch: TeamSettingsPatch): Observable<TeamSettingsDto> {
    return this.http.patch<TeamSettingsDto>(`/api/teams/${enc(teamId)}/settings`, patch, { context: new HttpContext().set(INLINE_ERRORS, true) });
  }
}
