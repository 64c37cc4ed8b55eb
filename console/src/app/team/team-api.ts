import { HttpClient, HttpHeaders } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';

import type { AuditEventPage, CreateInvitationRequest, InvitationResponse, Member, MemberPage, Role } from '../core/api-types.js';

const PAGE_SIZE = 100;
/** Invitations live 7 days; a page of the newest events covers far more than a team sends in a week. */
const INVITATION_EVENTS = 200;

/** The organisation's members and invitations, through /v1/members (and the audit trail for invitations sent). */
@Injectable({ providedIn: 'root' })
export class TeamApi {
  private readonly http = inject(HttpClient);

  members(cursor?: string): Observable<MemberPage> {
    const params: Record<string, string | number> = { limit: PAGE_SIZE };
    if (cursor) params['cursor'] = cursor;
    return this.http.get<MemberPage>('/v1/members', { params });
  }

  /** `idempotencyKey` stays the same for retries of one invitation, so a lost answer never sends two e-mails. */
  invite(request: CreateInvitationRequest, idempotencyKey: string): Observable<InvitationResponse> {
    return this.http.post<InvitationResponse>('/v1/members/invitations', request, { headers: new HttpHeaders({ 'Idempotency-Key': idempotencyKey }) });
  }

  changeRole(id: string, role: Role): Observable<Member> {
    return this.http.patch<Member>(`/v1/members/${encodeURIComponent(id)}`, { role });
  }

  remove(id: string): Observable<void> {
    return this.http.delete<void>(`/v1/members/${encodeURIComponent(id)}`);
  }

  /** The API keeps no list of open invitations; the audit trail records each one sent and each one accepted. */
  events(action: 'member.invited' | 'member.joined'): Observable<AuditEventPage> {
    return this.http.get<AuditEventPage>('/v1/audit-events', { params: { action, limit: INVITATION_EVENTS } });
  }
}
