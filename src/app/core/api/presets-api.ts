import { HttpClient, HttpContext, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import { PresetContentInput, PresetDto, PresetSave, PresetStatus, PresetVersionDto, presetSortKeys } from '../../../../shared/schemas/preset';
import type { LaneDto } from '../../../../shared/schemas/lane';
import { INLINE_ERRORS } from '../http/api-error';
import { enc } from './songs-api';

export interface PresetListQuery {
  genre?: string;
  q?: string;
  status?: PresetStatus;
  sort?: (typeof presetSortKeys)[number];
  order?: 'asc' | 'desc';
}

const inline = () => ({ context: new HttpContext().set(INLINE_ERRORS, true) });

/** The team library (docs/api.md, "Presets"): filtering and sorting happen on the server. */
@Injectable({ providedIn: 'root' })
export class PresetsApi {
  private readonly http = inject(HttpClient);

  private base(teamId: string): string {
    return `/api/teams/${enc(teamId)}/presets`;
  }

  list(teamId: string, query: PresetListQuery): Observable<PresetDto[]> {
    let params = new HttpParams();
    for (const [key, value] of Object.entries(query)) {
      if (value !== undefined && value !== '') params = params.set(key, String(value));
    }
    return this.http.get<PresetDto[]>(this.base(teamId), { params });
  }

  get(teamId: string, presetId: string): Observable<PresetDto> {
    return this.http.get<PresetDto>(`${this.base(teamId)}/${enc(presetId)}`);
  }

  /** Form errors come back to the dialog, which shows them beside the fields. */
  create(teamId: string, content: PresetContentInput): Observable<PresetDto> {
    return this.http.post<PresetDto>(this.base(teamId), content, inline());
  }

  /** `version` is the version the editor loaded; a stale one answers 409 `presets.stale`. */
  save(teamId: string, presetId: string, save: PresetSave): Observable<PresetDto> {
    return this.http.patch<PresetDto>(`${this.base(teamId)}/${enc(presetId)}`, save, inline());
  }

  setStatus(teamId: string, presetId: string, action: 'publish' | 'unpublish' | 'retire'): Observable<PresetDto> {
    return this.http.post<PresetDto>(`${this.base(teamId)}/${enc(presetId)}/${action}`, null);
  }

  duplicate(teamId: string, presetId: string): Observable<PresetDto> {
    return this.http.post<PresetDto>(`${this.base(teamId)}/${enc(presetId)}/duplicate`, null);
  }

  versions(teamId: string, presetId: string): Observable<PresetVersionDto[]> {
    return this.http.get<PresetVersionDto[]>(`${this.base(teamId)}/${enc(presetId)}/versions`);
  }

  restore(teamId: string, presetId: string, fromVersion: number, currentVersion: number): Observable<PresetDto> {
    return this.http.post<PresetDto>(`${this.base(teamId)}/${enc(presetId)}/versions/${fromVersion}/restore`, { version: currentVersion }, inline());
  }

  /** Where the browser downloads the preset file from (the server names it). */
  exportUrl(teamId: string, presetId: string): string {
    return `${this.base(teamId)}/${enc(presetId)}/export`;
  }

  /** Copies a preset's shape and gate threshold onto a lane (docs/api.md, "Team library"). */
  applyToLane(teamId: string, songId: string, laneId: string, presetId: string): Observable<LaneDto> {
    return this.http.post<LaneDto>(`/api/teams/${enc(teamId)}/songs/${enc(songId)}/lanes/${enc(laneId)}/apply-preset`, { presetId }, inline());
  }

  /** A new draft preset from a lane's saved shape. */
  fromLane(teamId: string, body: { songId: string; laneId: string; name: string; genre: string; notes?: string }): Observable<PresetDto> {
    return this.http.post<PresetDto>(`${this.base(teamId)}/from-lane`, body, inline());
  }

  /** The parsed file as it is: the server validates it and refuses it whole. */
  import(teamId: string, file: unknown): Observable<PresetDto[]> {
    return this.http.post<PresetDto[]>(`${this.base(teamId)}/import`, file, inline());
  }
}
