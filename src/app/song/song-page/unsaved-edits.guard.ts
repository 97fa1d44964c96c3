import { CanDeactivateFn } from '@angular/router';
import { Observable } from 'rxjs';

/** A page that may hold edits not saved yet. */
export interface LeaveConfirmation {
  confirmLeave(): Observable<boolean>;
}

/** Leaving a song with unsaved tuck edits asks first. */
export const unsavedEditsGuard: CanDeactivateFn<LeaveConfirmation> = (page) => page.confirmLeave();
