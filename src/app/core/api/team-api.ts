import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import { z } from 'zod';
import { Member, Role, memberSchema } from '../../../../shared/schemas/team';
import { enc } from './songs-api';

/** Members of one team (docs/api.md, "Teams and members"). */
@Injectable({ providedIn: 'root' })
export class TeamApi {
  private readonly http = inject(HttpClient);

  members(teamId: string): Observable<Member[]> {
    return this.http
      .get<unknown>(`/api/teams/${enc(teamId)}/members`)
      .pipe(map((body) => z.array(memberSchema).parse(body)));
  }

  changeRole(teamId: string, userId: string, role: Role): Observable<Member> {
    return this.http
      .patch<unknown>(`/api/teams/${enc(teamId)}/members/${enc(userId)}`, { role })
      .pipe(map((body) => memberSchema.parse(body)));
  }

  remove(teamId: string, userId: string): Observable<void> {
    return this.http.delete<void>(`/api/teams/${enc(teamId)}/members/${enc(userId)}`);
  }
}
