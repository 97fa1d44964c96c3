import { LiveAnnouncer } from '@angular/cdk/a11y';
import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { Subscription } from 'rxjs';
import { Stem, StemRole, stemRoles } from '../../../../shared/schemas/stem';
import { WorkspaceApi } from '../../core/api/workspace-api';
import { toApiFailure } from '../../core/http/api-error';
import { Icon } from '../../ui/icon/icon';
import { WorkspaceStore } from '../workspace/workspace-store';
import { UploadItem, formatBytes, precheck, queueItem } from './upload-queue';

interface SlotGroup {
  slot: string;
  role: StemRole;
  current: Stem | null;
  older: Stem[];
}

/** Drop or pick stems, watch each upload, and keep every revision at hand. */
@Component({
  selector: 'tl-stems-panel',
  imports: [DatePipe, FormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatProgressBarModule, Icon],
  templateUrl: './stems-panel.html',
  styleUrl: './stems-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StemsPanel {
  private readonly store = inject(WorkspaceStore);
  private readonly api = inject(WorkspaceApi);
  private readonly announcer = inject(LiveAnnouncer);
  private readonly subs = new Map<number, Subscription>();

  readonly canEdit = input(true);

  protected readonly roles = stemRoles;
  protected readonly queue = signal<UploadItem[]>([]);
  protected readonly dragOver = signal(false);
  protected readonly formatBytes = formatBytes;
  protected readonly groups = computed<SlotGroup[]>(() => {
    const bySlot = new Map<string, Stem[]>();
    for (const s of this.store.stems()) bySlot.set(s.slot, [...(bySlot.get(s.slot) ?? []), s]);
    return [...bySlot.entries()].map(([slot, list]) => {
      const sorted = [...list].sort((a, b) => b.revision - a.revision);
      const current = sorted.find((s) => s.isCurrent) ?? null;
      return { slot, role: sorted[0].role, current, older: sorted.filter((s) => s !== current) };
    });
  });
  protected readonly ready = computed(() => this.queue().filter((i) => i.state === 'ready').length);

  constructor() {
    inject(DestroyRef).onDestroy(() => this.subs.forEach((s) => s.unsubscribe()));
  }

  protected onDragOver(e: DragEvent): void {
    if (!this.canEdit()) return;
    e.preventDefault();
    if (e.dataTransfer) e.dataTransfer.dropEffect = 'copy';
    this.dragOver.set(true);
  }

  protected onDrop(e: DragEvent): void {
    e.preventDefault();
    this.dragOver.set(false);
    if (this.canEdit() && e.dataTransfer?.files.length) this.addFiles(e.dataTransfer.files);
  }

  protected onPick(e: Event): void {
    const input = e.target as HTMLInputElement;
    if (input.files?.length) this.addFiles(input.files);
    input.value = '';
  }

  addFiles(files: FileList | File[]): void {
    const items = Array.from(files).map((f) => {
      const item = queueItem(f);
      const problem = precheck(f);
      return problem ? { ...item, state: 'failed' as const, error: problem, refused: true } : item;
    });
    this.queue.update((q) => [...q, ...items]);
    void this.announcer.announce(`${items.length} ${items.length === 1 ? 'file' : 'files'} ready to upload.`);
  }

  protected patch(key: number, change: Partial<UploadItem>): void {
    this.queue.update((q) => q.map((i) => (i.key === key ? { ...i, ...change } : i)));
  }

  protected uploadAll(): void {
    for (const item of this.queue()) if (item.state === 'ready') this.upload(item);
  }

  protected upload(item: UploadItem): void {
    const { teamId, songId } = this.store.teamAndSong();
    this.patch(item.key, { state: 'uploading', progress: 0, error: null });
    const sub = this.api.uploadStem(teamId, songId, item.file, item.role, item.slot.trim() || undefined).subscribe({
      next: (ev) => {
        if (ev.kind === 'progress') this.patch(item.key, { progress: ev.fraction });
        else {
          this.patch(item.key, { state: 'done', progress: 1 });
          this.store.stemUploaded(ev.stem, ev.hitMap);
          void this.announcer.announce(`${item.file.name} uploaded as ${ev.stem.slot}, revision ${ev.stem.revision}.`);
        }
      },
      error: (err: unknown) => {
        const failure = toApiFailure(err);
        this.patch(item.key, { state: 'failed', error: failure.message });
        this.subs.delete(item.key);
      },
      complete: () => this.subs.delete(item.key),
    });
    this.subs.set(item.key, sub);
  }

  protected cancel(item: UploadItem): void {
    this.subs.get(item.key)?.unsubscribe();
    this.subs.delete(item.key);
    this.patch(item.key, { state: 'cancelled', error: null });
  }

  protected retry(item: UploadItem): void {
    this.patch(item.key, { state: 'ready', error: null, progress: 0 });
  }

  protected dismiss(item: UploadItem): void {
    this.queue.update((q) => q.filter((i) => i.key !== item.key));
  }

  protected restore(stem: Stem): void {
    this.store.restore(stem).subscribe(() => void this.announcer.announce(`Revision ${stem.revision} of ${stem.slot} is current again.`));
  }

  protected describe(s: Stem): string {
    if (s.format === 'midi') return `MIDI · ${s.durationSec.toFixed(1)} s`;
    const parts = [`${((s.sampleRate ?? 0) / 1000).toFixed(1)} kHz`, s.bitDepth ? `${s.bitDepth}-bit` : '', s.channels === 1 ? 'mono' : s.channels === 2 ? 'stereo' : `${s.channels} ch`, `${s.durationSec.toFixed(1)} s`];
    return parts.filter(Boolean).join(' · ');
  }
}
