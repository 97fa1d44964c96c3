import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import { Session } from '../../../../shared/schemas/auth';
import { InvitationDto, InvitationPreview } from '../../../../shared/schemas/invitation';
import { Role } from '../../../../shared/schemas/team';
import { INLINE_ERRORS } from '../http/api-error';
import { enc } from './songs-api';

const inline = () => ({ context: new HttpContext().set(INLINE_ERRORS, true) });

export type AcceptedInvitation = Session & { joinedTeamId: string };

/** Invitations: the owners' side under a team, and the public side the e-mailed link opens. */
@Injectable({ providedIn: 'root' })
export class InvitationsApi {
  private readonly http = inject(HttpClient);

  list(teamId: string): Observable<InvitationDto[]> {
    return this.http.get<InvitationDto[]>(`/api/teams/${enc(teamId)}/invitations`);
  }

  invite(teamId: string, email: string, role: Role): Observable<InvitationDto> {
    return this.http.post<InvitationDto>(`/api/teams/${enc(teamId)}/invitations`, { email, role }, inline());
  }

  resend(teamId: string, invitationId: string): Observable<InvitationDto> {
    return this.http.post<InvitationDto>(`/api/teams/${enc(teamId)}/invitations/${enc(invitationId)}/resend`, null);
  }

  revoke(teamId: string, invitationId: string): Observable<void> {
    return this.http.delete<void>(`/api/teams/${enc(teamId)}/invitations/${enc(invitationId)}`);
  }

  preview(token: string): Observable<InvitationPreview> {
    return this.http.get<InvitationPreview>(`/api/invitations/${enc(token)}`, inline());
  }

  accept(token: string, input: { displayName?: string; password?: string }): Observable<AcceptedInvitation> {
    return this.http.post<AcceptedInvitation>(`/api/invitations/${enc(token)}/accept`, input, inline());
  }
}
