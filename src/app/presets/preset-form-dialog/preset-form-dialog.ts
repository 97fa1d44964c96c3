import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { FormGroup, NonNullableFormBuilder, ReactiveFormsModule, ValidatorFn } from '@angular/forms';
import { MatAutocompleteModule } from '@angular/material/autocomplete';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatTooltipModule } from '@angular/material/tooltip';
import { map, startWith } from 'rxjs';
import type { z } from 'zod';
import { PresetDto, genreSchema, presetContentSchema, suggestedGenres } from '../../../../shared/schemas/preset';
import { tuckPointSchema, tuckShapeSchema } from '../../../../shared/schemas/tuck-shape';
import { PresetsApi } from '../../core/api/presets-api';
import { applyServerIssues, fieldError, zodValidator } from '../../core/forms/zod-validator';
import { FieldIssue, toApiFailure } from '../../core/http/api-error';
import { Icon } from '../../ui/icon/icon';
import { ShapeThumbnail } from '../../ui/shape-thumbnail/shape-thumbnail';
import { DrawnShape } from '../../ui/shape-thumbnail/shape-geometry';
import {
  PresetFormValue,
  blankPresetForm,
  editedFields,
  fieldLabels,
  formToContent,
  presetToForm,
  reapplyEdits,
} from './preset-form-value';

export interface PresetFormDialogData {
  teamId: string;
  /** Present when editing: the preset as loaded (its `version` is sent back with the save). */
  preset?: PresetDto;
}

/** A number field: empty says so plainly, otherwise the shared schema's message. */
function numberField(schema: z.ZodType): ValidatorFn {
  const bySchema = zodValidator(schema);
  return (control) => (control.value === null || control.value === '' ? { zod: 'Enter a number.' } : bySchema(control));
}

@Component({
  selector: 'tl-preset-form-dialog',
  imports: [
    ReactiveFormsModule,
    MatDialogModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatAutocompleteModule,
    MatButtonModule,
    MatProgressBarModule,
    MatTooltipModule,
    Icon,
    ShapeThumbnail,
  ],
  templateUrl: './preset-form-dialog.html',
  styleUrl: './preset-form-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PresetFormDialog {
  private readonly api = inject(PresetsApi);
  private readonly dialogRef = inject<MatDialogRef<PresetFormDialog, PresetDto>>(MatDialogRef);
  private readonly destroyRef = inject(DestroyRef);
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly data = inject<PresetFormDialogData>(MAT_DIALOG_DATA);

  /** The version this editor started from, and its values (to tell the person's edits from the rest). */
  private loadedVersion = this.data.preset?.version ?? 0;
  private loaded: PresetFormValue = this.data.preset ? presetToForm(this.data.preset) : blankPresetForm();

  protected readonly form = this.fb.group({
    name: [this.loaded.name, zodValidator(presetContentSchema.shape.name)],
    genre: [this.loaded.genre, zodValidator(genreSchema)],
    notes: [this.loaded.notes, zodValidator(presetContentSchema.shape.notes)],
    gateThresholdDbfs: this.fb.control<number | null>(this.loaded.gateThresholdDbfs, numberField(presetContentSchema.shape.gateThresholdDbfs)),
    shape: this.fb.group({
      points: this.fb.array(this.loaded.shape.points.map((p) => this.pointGroup(p))),
      slopeGuardMs: this.fb.control<number | null>(this.loaded.shape.slopeGuardMs, numberField(tuckShapeSchema.shape.slopeGuardMs)),
      floorDb: this.fb.control<number | null>(this.loaded.shape.floorDb, numberField(tuckShapeSchema.shape.floorDb)),
      depthDb: this.fb.control<number | null>(this.loaded.shape.depthDb),
    }),
  });
  protected readonly points = this.form.controls.shape.controls.points;
  protected readonly busy = signal(false);
  protected readonly formError = signal<string | null>(null);
  /** Set when the save answered 409 `presets.stale`. */
  protected readonly stale = signal<string | null>(null);
  protected readonly notice = signal<string | null>(null);
  protected readonly fieldError = fieldError;
  protected readonly editing = !!this.data.preset;

  private readonly value = toSignal(this.form.valueChanges.pipe(startWith(null), map(() => this.form.getRawValue() as PresetFormValue)), {
    initialValue: this.loaded,
  });
  protected readonly genreOptions = computed(() => {
    const typed = (this.value().genre ?? '').trim().toLowerCase();
    return suggestedGenres.filter((g) => g.includes(typed));
  });
  /** The drawing follows the table while its points make a valid shape. */
  private lastGood: DrawnShape = { points: formToContent(this.loaded).shape.points };
  protected readonly preview = computed<DrawnShape>(() => {
    const parsed = tuckShapeSchema.safeParse(formToContent(this.value()).shape);
    if (parsed.success) this.lastGood = { points: parsed.data.points };
    return this.lastGood;
  });

  private pointGroup(p: PresetFormValue['shape']['points'][number]) {
    return this.fb.group({
      tMs: this.fb.control<number | null>(p.tMs, numberField(tuckPointSchema.shape.tMs)),
      gainDb: this.fb.control<number | null>(p.gainDb, numberField(tuckPointSchema.shape.gainDb)),
      curve: this.fb.control<'linear' | 'smooth'>(p.curve),
    });
  }

  protected addPoint(): void {
    const last = this.points.at(this.points.length - 1)?.getRawValue();
    this.points.push(this.pointGroup({ tMs: (last?.tMs ?? 0) + 20, gainDb: 0, curve: 'linear' }));
  }

  protected removePoint(index: number): void {
    if (this.points.length > 2) this.points.removeAt(index);
  }

  protected submit(): void {
    this.formError.set(null);
    this.stale.set(null);
    const parsed = presetContentSchema.safeParse(formToContent(this.form.getRawValue() as PresetFormValue));
    if (!parsed.success) {
      const issues: FieldIssue[] = parsed.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
      const rest = applyServerIssues(this.form as unknown as FormGroup, issues);
      this.form.markAllAsTouched();
      if (rest.length) this.formError.set(rest[0].message);
      return;
    }
    this.busy.set(true);
    const preset = this.data.preset;
    const request = preset
      ? this.api.save(this.data.teamId, preset.id, { ...parsed.data, version: this.loadedVersion })
      : this.api.create(this.data.teamId, parsed.data);
    request.pipe(takeUntilDestroyed(this.destroyRef)).subscribe({
      next: (saved) => this.dialogRef.close(saved),
      error: (err: unknown) => {
        this.busy.set(false);
        const failure = toApiFailure(err);
        if (failure.code === 'presets.stale') {
          this.stale.set(failure.message);
          return;
        }
        const rest = applyServerIssues(this.form as unknown as FormGroup, failure.issues);
        this.formError.set(failure.issues.length && !rest.length ? null : failure.message);
      },
    });
  }

  /** Loads the newest version and lays this person's unsaved edits over it, field by field. */
  protected reloadAndReapply(): void {
    const preset = this.data.preset;
    if (!preset) return;
    const mine = this.form.getRawValue() as PresetFormValue;
    const fields = editedFields(this.loaded, mine);
    this.busy.set(true);
    this.api
      .get(this.data.teamId, preset.id)
      .pipe(takeUntilDestroyed(this.destroyRef))
      .subscribe({
        next: (fresh) => {
          this.busy.set(false);
          this.stale.set(null);
          this.loadedVersion = fresh.version;
          this.loaded = presetToForm(fresh);
          this.setValue(reapplyEdits(this.loaded, mine, fields));
          const changed = fields.map((f) => fieldLabels[f]).join(', ');
          this.notice.set(
            fields.length
              ? `Loaded version ${fresh.version}. Your changes to ${changed} are applied on top: check them, then save again.`
              : `Loaded version ${fresh.version}. You had no changes of your own to apply.`,
          );
        },
        error: (err: unknown) => {
          this.busy.set(false);
          this.formError.set(toApiFailure(err).message);
        },
      });
  }

  private setValue(v: PresetFormValue): void {
    const points = this.points;
    points.clear({ emitEvent: false });
    for (const p of v.shape.points) points.push(this.pointGroup(p), { emitEvent: false });
    this.form.setValue(v);
    this.form.markAsDirty();
  }
}
