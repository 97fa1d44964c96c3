import { ChangeDetectionStrategy, Component, DestroyRef, computed, effect, inject, signal } from '@angular/core';
import { rxResource, takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormControl, NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { PresetDto } from '../../../../shared/schemas/preset';
import { teamSettingsSchema } from '../../../../shared/schemas/invitation';
import { teamNameSchema } from '../../../../shared/schemas/team';
import { PresetsApi } from '../../core/api/presets-api';
import { TeamSettingsApi, TeamSettingsDto } from '../../core/api/team-settings-api';
import { AuthService } from '../../core/auth/auth.service';
import { fieldError, zodValidator } from '../../core/forms/zod-validator';
import { toApiFailure } from '../../core/http/api-error';

const exportShape = teamSettingsSchema.shape.defaultExport.unwrap().shape;

/** Team name, default export options and default preset per genre: owners edit, everyone reads. */
@Component({
  selector: 'tl-team-settings',
  imports: [ReactiveFormsModule, MatFormFieldModule, MatInputModule, MatSelectModule, MatCheckboxModule, MatButtonModule, MatProgressBarModule],
  templateUrl: './team-settings.html',
  styleUrl: './team-settings.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TeamSettings {
  private readonly api = inject(TeamSettingsApi);
  private readonly presetsApi = inject(PresetsApi);
  private readonly auth = inject(AuthService);
  private readonly snackBar = inject(MatSnackBar);
  private readonly destroyRef = inject(DestroyRef);
  private readonly fb = inject(NonNullableFormBuilder);

  protected readonly team = this.auth.team;
  protected readonly mayEdit = computed(() => this.auth.role() !== null && this.auth.can('manageTeam'));
  protected readonly settings = rxResource({ params: () => this.team()?.id, stream: ({ params: teamId }) => this.api.get(teamId) });
  protected readonly published = rxResource({
    params: () => this.team()?.id,
    stream: ({ params: teamId }) => this.presetsApi.list(teamId, { status: 'published', sort: 'name', order: 'asc' }),
  });

  protected readonly form = this.fb.group({
    name: ['', zodValidator(teamNameSchema)],
    cc: this.fb.control<number | null>(11, zodValidator(exportShape.cc)),
    channel: this.fb.control<number | null>(1, zodValidator(exportShape.channel)),
    ppq: this.fb.control<number | null>(960, zodValidator(exportShape.ppq)),
    fourteenBit: [false],
  });
  /** One select per genre that has published presets (or a default already). */
  protected readonly byGenre = signal<{ genre: string; control: FormControl<string>; options: PresetDto[] }[]>([]);
  protected readonly busy = signal(false);
  protected readonly formError = signal<string | null>(null);
  protected readonly fieldError = fieldError;
  protected readonly loadError = computed(() => {
    const err = this.settings.error();
    return err ? toApiFailure(err).message : null;
  });

  constructor() {
    effect(() => {
      if (!this.settings.hasValue()) return;
      const s = this.settings.value();
      const presets = this.published.hasValue() ? this.published.value() : [];
      this.fill(s, presets);
    });
    effect(() => (this.mayEdit() ? this.form.enable() : this.form.disable()));
  }

  private fill(s: TeamSettingsDto, presets: PresetDto[]): void {
    this.form.reset({ name: s.name, ...s.defaultExport });
    const genres = [...new Set([...presets.map((p) => p.genre), ...Object.keys(s.defaultPresetByGenre)])].sort();
    this.byGenre.set(
      genres.map((genre) => {
        const control = this.fb.control(s.defaultPresetByGenre[genre] ?? '');
        if (!this.mayEdit()) control.disable();
        return { genre, control, options: presets.filter((p) => p.genre === genre) };
      }),
    );
  }

  protected save(): void {
    const team = this.team();
    this.formError.set(null);
    if (!team || this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    const v = this.form.getRawValue();
    this.busy.set(true);
    this.api
      .save(team.id, {
        name: v.name,
        defaultExport: { cc: v.cc ?? undefined, channel: v.channel ?? undefined, ppq: v.ppq ?? undefined, fourteenBit: v.fourteenBit },
        defaultPresetByGenre: Object.fromEntries(this.byGenre().map((g) => [g.genre, g.control.value || null])),
      })
      .pipe(takeUntilDestroyed(this.destroyRef))
      .subscribe({
        next: (saved) => {
          this.busy.set(false);
          this.settings.set(saved);
          this.snackBar.open('Team settings saved.', undefined, { duration: 4000 });
          // The team's name shows in the navigation, which reads it from the session.
          if (saved.name !== team.name) this.auth.refresh().subscribe();
        },
        error: (err: unknown) => {
          this.busy.set(false);
          this.formError.set(toApiFailure(err).message);
        },
      });
  }
}
