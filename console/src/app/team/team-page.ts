import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTableModule } from '@angular/material/table';
import { MatTooltip } from '@angular/material/tooltip';
import { firstValueFrom, forkJoin } from 'rxjs';

import type { Member, Role } from '../core/api-types.js';
import { Auth } from '../core/auth.js';
import { roleMay } from '../core/capabilities.js';
import { CLOCK } from '../core/clock.js';
import { randomIdempotencyKey } from '../core/idempotency.js';
import { problemMessage } from '../core/problem-details.js';
import { MemberRemoveDialog } from './member-remove-dialog.js';
import { type PendingInvitation, pendingInvitations } from './pending-invitations.js';
import { TeamApi } from './team-api.js';

type Listing = { state: 'loading' } | { state: 'ready'; members: Member[] } | { state: 'failed'; reason: string };
type Invitations = { state: 'loading' } | { state: 'ready'; pending: PendingInvitation[] } | { state: 'failed'; reason: string };

export const ROLES: readonly Role[] = ['admin', 'estimator', 'viewer'];
// The API's own address check is stricter (shared/schemas/accounts.ts); this catches typos before a round trip.
const EMAIL = /^[^\s@]+@[^\s@]+\.[^\s@]+$/;

/** Members with their roles, invitations out, and the admin's changes to both. */
@Component({
  selector: 'tw-team-page',
  imports: [
    DatePipe,
    ReactiveFormsModule,
    MatTableModule,
    MatButton,
    MatIconButton,
    MatIcon,
    MatFormField,
    MatLabel,
    MatHint,
    MatError,
    MatInput,
    MatSelect,
    MatOption,
    MatProgressBar,
    MatTooltip,
  ],
  templateUrl: './team-page.html',
  styleUrl: './team-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TeamPage {
  private readonly api = inject(TeamApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly auth = inject(Auth);
  private readonly now = inject(CLOCK);
  /** The invitation last sent without an answer: a retry of the same address and role reuses its key. */
  private unanswered: { body: string; idempotencyKey: string } | null = null;

  protected readonly roles = ROLES;
  protected readonly columns = ['name', 'email', 'role', 'joined', 'actions'] as const;
  protected readonly listing = signal<Listing>({ state: 'loading' });
  protected readonly invitations = signal<Invitations>({ state: 'loading' });
  protected readonly mayManage = computed(() => roleMay(this.auth.role(), 'members:manage'));
  protected readonly me = computed(() => this.auth.user()?.id ?? null);
  protected readonly busyIds = signal<ReadonlySet<string>>(new Set());
  protected readonly inviting = signal(false);
  protected readonly inviteFailure = signal<string | null>(null);

  protected readonly inviteForm = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.maxLength(254), Validators.pattern(EMAIL)]],
    role: ['viewer' as Role, Validators.required],
  });

  constructor() {
    if (this.mayManage()) this.load();
  }

  protected load(): void {
    this.listing.set({ state: 'loading' });
    this.invitations.set({ state: 'loading' });
    this.loadAllMembers()
      .then((members) => {
        this.listing.set({ state: 'ready', members });
        this.loadInvitations(members);
      })
      .catch((error: unknown) => {
        this.listing.set({ state: 'failed', reason: problemMessage(error) });
        this.invitations.set({ state: 'failed', reason: problemMessage(error) });
      });
  }

  private async loadAllMembers(): Promise<Member[]> {
    const members: Member[] = [];
    let cursor: string | undefined;
    do {
      const page = await firstValueFrom(this.api.members(cursor));
      members.push(...page.items);
      cursor = page.nextCursor ?? undefined;
    } while (cursor);
    return members;
  }

  private loadInvitations(members: Member[]): void {
    forkJoin({ invited: this.api.events('member.invited'), joined: this.api.events('member.joined') }).subscribe({
      next: ({ invited, joined }) => this.invitations.set({ state: 'ready', pending: pendingInvitations(invited.items, joined.items, members, this.now()) }),
      error: (error: unknown) => this.invitations.set({ state: 'failed', reason: problemMessage(error) }),
    });
  }

  protected async invite(): Promise<void> {
    this.inviteForm.markAllAsTouched();
    if (this.inviteForm.invalid || this.inviting()) return;
    const request = { email: this.inviteForm.controls.email.value.trim(), role: this.inviteForm.controls.role.value };
    await this.send(request, () => this.inviteForm.reset({ email: '', role: request.role }));
  }

  protected async resend(invitation: PendingInvitation): Promise<void> {
    await this.send({ email: invitation.email, role: invitation.role }, () => undefined);
  }

  private async send(request: { email: string; role: Role }, done: () => void): Promise<void> {
    const body = JSON.stringify(request);
    const idempotencyKey = this.unanswered?.body === body ? this.unanswered.idempotencyKey : randomIdempotencyKey();
    this.unanswered = { body, idempotencyKey };
    this.inviting.set(true);
    this.inviteFailure.set(null);
    try {
      const { invitation } = await firstValueFrom(this.api.invite(request, idempotencyKey));
      this.unanswered = null;
      done();
      this.addPending({ ...invitation, sentAt: this.now().toISOString() });
      this.tell(`Invitation sent to ${invitation.email}.`);
    } catch (error) {
      // A refusal is stored under its key and replayed: only a lost answer is retried with the same key.
      if (!isLost(error)) this.unanswered = null;
      this.inviteFailure.set(problemMessage(error));
    } finally {
      this.inviting.set(false);
    }
  }

  private addPending(invitation: PendingInvitation): void {
    const current = this.invitations();
    const others = current.state === 'ready' ? current.pending.filter((p) => p.email !== invitation.email) : [];
    this.invitations.set({ state: 'ready', pending: [invitation, ...others] });
  }

  protected async changeRole(member: Member, role: Role): Promise<void> {
    if (role === member.role) return;
    this.markBusy(member.id, true);
    try {
      const updated = await firstValueFrom(this.api.changeRole(member.id, role));
      this.replace(updated);
      this.tell(`${member.name ?? member.email} is now ${updated.role}.`);
    } catch (error) {
      this.replace({ ...member }); // the select shows the role the API kept
      this.tell(problemMessage(error));
    } finally {
      this.markBusy(member.id, false);
    }
  }

  protected async remove(member: Member): Promise<void> {
    const ref = this.dialog.open<MemberRemoveDialog, Member, boolean>(MemberRemoveDialog, { data: member, maxWidth: '95vw' });
    if (!(await firstValueFrom(ref.afterClosed()))) return;
    this.markBusy(member.id, true);
    try {
      await firstValueFrom(this.api.remove(member.id));
      const current = this.listing();
      if (current.state === 'ready') this.listing.set({ state: 'ready', members: current.members.filter((m) => m.id !== member.id) });
      this.tell(`Removed ${member.name ?? member.email}.`);
    } catch (error) {
      this.tell(problemMessage(error));
    } finally {
      this.markBusy(member.id, false);
    }
  }

  private replace(member: Member): void {
    const current = this.listing();
    if (current.state !== 'ready') return;
    this.listing.set({ state: 'ready', members: current.members.map((m) => (m.id === member.id ? member : m)) });
  }

  private markBusy(id: string, busy: boolean): void {
    const next = new Set(this.busyIds());
    if (busy) next.add(id);
    else next.delete(id);
    this.busyIds.set(next);
  }

  private tell(message: string): void {
    this.snackBar.open(message, 'Dismiss', { duration: 6000 });
  }
}

/** No HTTP answer reached the browser, or a server error the API does not store: the outcome is unknown. */
function isLost(error: unknown): boolean {
  const status = (error as { status?: unknown } | null)?.status;
  return typeof status === 'number' && (status === 0 || status >= 500);
}
