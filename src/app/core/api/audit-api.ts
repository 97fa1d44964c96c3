import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import { enc } from './songs-api';

export interface AuditEvent {
  id: string;
  action: string;
  actor: { id: string; displayName: string } | null;
  subjectType: string | null;
  subjectId: string | null;
  details: Record<string, unknown> | null;
  at: string;
}

export interface AuditQuery {
  action?: string;
  actorId?: string;
  /** ISO 8601 with offset. */
  from?: string;
  to?: string;
  page: number;
  pageSize: number;
}

/** The team's audit trail (owners), newest first, a page at a time. */
@Injectable({ providedIn: 'root' })
export class AuditApi {
  private readonly http = inject(HttpClient);

  list(teamId: string, query: AuditQuery): Observable<{ total: number; items: AuditEvent[] }> {
    let params = new HttpParams();
    for (const [key, value] of Object.entries(query)) {
      if (value !== undefined && value !== '') params = params.set(key, String(value));
    }
    return this.http.get<{ total: number; items: AuditEvent[] }>(`/api/teams/${enc(teamId)}/audit`, { params });
  }
}
