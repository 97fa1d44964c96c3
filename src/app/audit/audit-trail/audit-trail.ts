import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, PageEvent } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { AuditApi, AuditEvent, AuditQuery } from '../../core/api/audit-api';
import { TeamApi } from '../../core/api/team-api';
import { AuthService } from '../../core/auth/auth.service';
import { toApiFailure } from '../../core/http/api-error';
import { actionInWords, auditActionGroups, dayBoundary, detailsSummary } from '../audit-words';

/** The team's trail for owners: who did what and when, filtered and paged on the server. */
@Component({
  selector: 'tl-audit-trail',
  imports: [DatePipe, MatTableModule, MatPaginatorModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatButtonModule, MatProgressBarModule],
  templateUrl: './audit-trail.html',
  styleUrl: './audit-trail.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AuditTrail {
  private readonly api = inject(AuditApi);
  private readonly teamApi = inject(TeamApi);
  private readonly auth = inject(AuthService);

  protected readonly team = this.auth.team;
  protected readonly groups = auditActionGroups;
  protected readonly columns = ['at', 'actor', 'action', 'details'];
  protected readonly action = signal('');
  protected readonly actorId = signal('');
  protected readonly fromDay = signal('');
  protected readonly toDay = signal('');
  protected readonly page = signal({ index: 0, size: 25 });

  protected readonly members = rxResource({ params: () => this.team()?.id, stream: ({ params: teamId }) => this.teamApi.members(teamId) });
  protected readonly events = rxResource({
    params: () => {
      const team = this.team();
      if (!team) return undefined;
      const query: AuditQuery = {
        action: this.action() || undefined,
        actorId: this.actorId() || undefined,
        from: dayBoundary(this.fromDay(), 'start'),
        to: dayBoundary(this.toDay(), 'end'),
        page: this.page().index,
        pageSize: this.page().size,
      };
      return { teamId: team.id, query };
    },
    stream: ({ params }) => this.api.list(params.teamId, params.query),
  });
  protected readonly rows = computed<AuditEvent[]>(() => (this.events.hasValue() ? this.events.value().items : []));
  protected readonly total = computed(() => (this.events.hasValue() ? this.events.value().total : 0));
  protected readonly errorMessage = computed(() => {
    const err = this.events.error();
    return err ? toApiFailure(err).message : null;
  });
  protected readonly filtered = computed(() => !!(this.action() || this.actorId() || this.fromDay() || this.toDay()));
  protected readonly words = actionInWords;
  protected readonly summary = detailsSummary;

  /** Any filter change starts again at the first page. */
  protected setFilter(which: 'action' | 'actorId' | 'fromDay' | 'toDay', value: string): void {
    this[which].set(value ?? '');
    this.page.update((p) => ({ ...p, index: 0 }));
  }

  protected onDay(which: 'fromDay' | 'toDay', event: Event): void {
    this.setFilter(which, (event.target as HTMLInputElement).value);
  }

  protected clear(): void {
    for (const s of [this.action, this.actorId, this.fromDay, this.toDay]) s.set('');
    this.page.update((p) => ({ ...p, index: 0 }));
  }

  protected onPage(event: PageEvent): void {
    this.page.set({ index: event.pageIndex, size: event.pageSize });
  }
}
