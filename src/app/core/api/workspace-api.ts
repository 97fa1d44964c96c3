import { HttpClient, HttpContext, HttpEvent, HttpEventType, HttpRequest } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, filter, map } from 'rxjs';
import { z } from 'zod';
import type { BassActivityLevels } from '../../../../shared/dsp/bass-gate';
import { ExportDto, ExportRequest } from '../../../../shared/schemas/export-request';
import { HitEdit, HitMapDto, DetectRequest } from '../../../../shared/schemas/hit-map';
import { LaneCreate, LaneDto, LanePatch } from '../../../../shared/schemas/lane';
import { Stem, StemOverview, StemRole, stemSchema } from '../../../../shared/schemas/stem';
import { INLINE_ERRORS } from '../http/api-error';
import { enc } from './songs-api';

/** One step of an upload: progress (0…1) until the server answers with the stem. */
export type UploadEvent = { kind: 'progress'; fraction: number } | { kind: 'done'; stem: Stem; hitMap?: HitMapDto };

const uploadResultSchema = z.object({ stem: stemSchema, hitMap: z.unknown().optional() });

/** Stems, hit map, lanes and exports of one song (docs/api.md, "Song workspace"). */
@Injectable({ providedIn: 'root' })
export class WorkspaceApi {
  private readonly http = inject(HttpClient);

  private base(teamId: string, songId: string): string {
    return `/api/teams/${enc(teamId)}/songs/${enc(songId)}`;
  }

  // ---- stems
  stems(teamId: string, songId: string): Observable<Stem[]> {
    return this.http.get<unknown>(`${this.base(teamId, songId)}/stems`).pipe(map((b) => z.array(stemSchema).parse(b)));
  }

  /** Streams the file with upload progress; errors come back to the file's row (no snack bar). */
  uploadStem(teamId: string, songId: string, file: File, role: StemRole, slot?: string): Observable<UploadEvent> {
    const form = new FormData();
    form.append('role', role);
    if (slot) form.append('slot', slot);
    form.append('file', file, file.name);
    const req = new HttpRequest('POST', `${this.base(teamId, songId)}/stems`, form, {
      reportProgress: true,
      context: new HttpContext().set(INLINE_ERRORS, true),
    });
    return this.http.request(req).pipe(
      filter((e: HttpEvent<unknown>) => e.type === HttpEventType.UploadProgress || e.type === HttpEventType.Response),
      map((e): UploadEvent => {
        if (e.type === HttpEventType.UploadProgress) return { kind: 'progress', fraction: e.total ? e.loaded / e.total : 0 };
        const body = uploadResultSchema.parse((e as { body: unknown }).body);
        return { kind: 'done', stem: body.stem, hitMap: body.hitMap as HitMapDto | undefined };
      }),
    );
  }

  restoreStem(teamId: string, songId: string, stemId: string): Observable<{ stem: Stem; hitMap?: HitMapDto }> {
    return this.http.post<{ stem: Stem; hitMap?: HitMapDto }>(`${this.base(teamId, songId)}/stems/${enc(stemId)}/restore`, null);
  }

  overview(teamId: string, songId: string, stemId: string): Observable<StemOverview> {
    return this.http.get<StemOverview>(`${this.base(teamId, songId)}/stems/${enc(stemId)}/overview`);
  }

  activity(teamId: string, songId: string, stemId: string): Observable<BassActivityLevels> {
    return this.http.get<BassActivityLevels>(`${this.base(teamId, songId)}/stems/${enc(stemId)}/activity`);
  }

  // ---- hits
  /** The hit map, or null when the song has none yet (404 `hits.no_hit_map`). */
  hitMap(teamId: string, songId: string): Observable<HitMapDto> {
    return this.http.get<HitMapDto>(`${this.base(teamId, songId)}/hits`, { context: new HttpContext().set(INLINE_ERRORS, true) });
  }

  detect(teamId: string, songId: string, request: DetectRequest): Observable<HitMapDto> {
    return this.http.post<HitMapDto>(`${this.base(teamId, songId)}/hits/detect`, request);
  }

  editHits(teamId: string, songId: string, edit: HitEdit): Observable<HitMapDto> {
    return this.http.patch<HitMapDto>(`${this.base(teamId, songId)}/hits`, edit);
  }

  acknowledge(teamId: string, songId: string): Observable<HitMapDto> {
    return this.http.post<HitMapDto>(`${this.base(teamId, songId)}/hits/acknowledge`, null);
  }

  // ---- lanes
  lanes(teamId: string, songId: string): Observable<LaneDto[]> {
    return this.http.get<LaneDto[]>(`${this.base(teamId, songId)}/lanes`);
  }

  createLane(teamId: string, songId: string, lane: LaneCreate): Observable<LaneDto> {
    return this.http.post<LaneDto>(`${this.base(teamId, songId)}/lanes`, lane);
  }

  patchLane(teamId: string, songId: string, laneId: string, patch: LanePatch): Observable<LaneDto> {
    return this.http.patch<LaneDto>(`${this.base(teamId, songId)}/lanes/${enc(laneId)}`, patch);
  }

  removeLane(teamId: string, songId: string, laneId: string): Observable<void> {
    return this.http.delete<void>(`${this.base(teamId, songId)}/lanes/${enc(laneId)}`);
  }

  // ---- exports
  exports(teamId: string, songId: string): Observable<ExportDto[]> {
    return this.http.get<ExportDto[]>(`${this.base(teamId, songId)}/exports`);
  }

  createExport(teamId: string, songId: string, request: ExportRequest): Observable<ExportDto> {
    return this.http.post<ExportDto>(`${this.base(teamId, songId)}/exports`, request, { context: new HttpContext().set(INLINE_ERRORS, true) });
  }

  exportFileUrl(teamId: string, songId: string, exportId: string): string {
    return `${this.base(teamId, songId)}/exports/${enc(exportId)}/file`;
  }
}
