import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import type { HeadroomReportDto } from '../../../../shared/schemas/report';
import { INLINE_ERRORS } from '../http/api-error';
import { enc } from './songs-api';

/** The headroom report and the stem files the preview plays (docs/api.md, "Headroom report"). */
@Injectable({ providedIn: 'root' })
export class ReportApi {
  private readonly http = inject(HttpClient);

  /** Errors (no lanes yet, MIDI kick) come back to the panel, which explains them in place. */
  report(teamId: string, songId: string): Observable<HeadroomReportDto> {
    return this.http.get<HeadroomReportDto>(`/api/teams/${enc(teamId)}/songs/${enc(songId)}/report`, { context: new HttpContext().set(INLINE_ERRORS, true) });
  }

  printableUrl(teamId: string, songId: string): string {
    return `/api/teams/${enc(teamId)}/songs/${enc(songId)}/report/printable`;
  }

  stemFile(teamId: string, songId: string, stemId: string): Observable<ArrayBuffer> {
    return this.http.get(`/api/teams/${enc(teamId)}/songs/${enc(songId)}/stems/${enc(stemId)}/file`, { responseType: 'arraybuffer' });
  }
}
