import { HttpClient, HttpContext, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import { Song, SongInput, SongList, SongListQuery, songListSchema, songSchema } from '../../../../shared/schemas/song';
import { INLINE_ERRORS } from '../http/api-error';

/** Songs of one team (docs/api.md, "Songs"). Responses are checked against the shared schemas. */
@Injectable({ providedIn: 'root' })
export class SongsApi {
  private readonly http = inject(HttpClient);

  list(teamId: string, query: Partial<SongListQuery>): Observable<SongList> {
    let params = new HttpParams();
    for (const [key, value] of Object.entries(query)) {
      if (value !== undefined && value !== '') params = params.set(key, String(value));
    }
    return this.http
      .get<unknown>(`/api/teams/${enc(teamId)}/songs`, { params })
      .pipe(map((body) => songListSchema.parse(body)));
  }

  get(teamId: string, songId: string): Observable<Song> {
    return this.http
      .get<unknown>(`/api/teams/${enc(teamId)}/songs/${enc(songId)}`)
      .pipe(map((body) => songSchema.parse(body)));
  }

  /** Errors come back to the form, which shows them beside the fields. */
  create(teamId: string, input: SongInput): Observable<Song> {
    return this.http
      .post<unknown>(`/api/teams/${enc(teamId)}/songs`, input, { context: new HttpContext().set(INLINE_ERRORS, true) })
      .pipe(map((body) => songSchema.parse(body)));
  }

  update(teamId: string, songId: string, patch: Partial<SongInput>): Observable<Song> {
    return this.http
      .patch<unknown>(`/api/teams/${enc(teamId)}/songs/${enc(songId)}`, patch, { context: new HttpContext().set(INLINE_ERRORS, true) })
      .pipe(map((body) => songSchema.parse(body)));
  }

  remove(teamId: string, songId: string): Observable<void> {
    return this.http.delete<void>(`/api/teams/${enc(teamId)}/songs/${enc(songId)}`);
  }
}

export function enc(id: string): string {
  return encodeURIComponent(id);
}
