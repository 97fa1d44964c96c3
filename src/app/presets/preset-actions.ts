import { Injectable, inject } from '@angular/core';
import { MatDialog } from '@angular/material/dialog';
import { MatSnackBar } from '@angular/material/snack-bar';
import { EMPTY, Observable, filter, switchMap, tap } from 'rxjs';
import { PresetDto } from '../../../shared/schemas/preset';
import { PresetsApi } from '../core/api/presets-api';
import { ConfirmDialog, ConfirmDialogData } from '../ui/confirm-dialog/confirm-dialog';
import { PresetFormDialog, PresetFormDialogData } from './preset-form-dialog/preset-form-dialog';

/** What the library and the detail page both do to a preset; each answers with the preset as saved. */
@Injectable({ providedIn: 'root' })
export class PresetActions {
  private readonly api = inject(PresetsApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);

  /** Opens the create (no preset) or edit dialog; emits only when something was saved. */
  openForm(teamId: string, preset?: PresetDto): Observable<PresetDto> {
    const data: PresetFormDialogData = { teamId, preset };
    return this.dialog
      .open<PresetFormDialog, PresetFormDialogData, PresetDto>(PresetFormDialog, { data, width: '920px', maxWidth: '96vw', autoFocus: 'first-tabbable' })
      .afterClosed()
      .pipe(
        filter((saved): saved is PresetDto => !!saved),
        tap((saved) => this.say(preset ? `Saved “${saved.name}” as version ${saved.version}.` : `Created “${saved.name}” as a draft.`)),
      );
  }

  duplicate(teamId: string, preset: PresetDto): Observable<PresetDto> {
    return this.api.duplicate(teamId, preset.id).pipe(tap((copy) => this.say(`Made “${copy.name}” (a draft).`)));
  }

  publish(teamId: string, preset: PresetDto): Observable<PresetDto> {
    return this.api.setStatus(teamId, preset.id, 'publish').pipe(tap((p) => this.say(`“${p.name}” is published: the whole team can apply it.`)));
  }

  unpublish(teamId: string, preset: PresetDto): Observable<PresetDto> {
    return this.api.setStatus(teamId, preset.id, 'unpublish').pipe(tap((p) => this.say(`“${p.name}” is a draft again; assistants no longer see it.`)));
  }

  retire(teamId: string, preset: PresetDto): Observable<PresetDto> {
    const data: ConfirmDialogData = {
      title: `Retire “${preset.name}”?`,
      message: 'It leaves the library and cannot be applied any more. Lanes that use it keep their shape. You can find it again under the Retired status.',
      confirmLabel: 'Retire preset',
    };
    return this.dialog
      .open<ConfirmDialog, ConfirmDialogData, boolean>(ConfirmDialog, { data, width: '440px' })
      .afterClosed()
      .pipe(
        switchMap((ok) => (ok ? this.api.setStatus(teamId, preset.id, 'retire') : EMPTY)),
        tap((p) => this.say(`“${p.name}” is retired.`)),
      );
  }

  private say(message: string): void {
    this.snackBar.open(message, undefined, { duration: 4000 });
  }
}
