import { Routes } from '@angular/router';
import { authGuard, guestGuard, permissionGuard } from './core/auth/auth.guard';
import { unsavedEditsGuard } from './song/song-page/unsaved-edits.guard';

export const routes: Routes = [
  {
    path: 'sign-in',
    title: 'Sign in · Tuckline',
    canActivate: [guestGuard],
    loadComponent: () => import('./auth/sign-in/sign-in').then((m) => m.SignIn),
  },
  {
    path: 'sign-up',
    title: 'Create an account · Tuckline',
    canActivate: [guestGuard],
    loadComponent: () => import('./auth/sign-up/sign-up').then((m) => m.SignUp),
  },
  {
    path: 'reset-password',
    title: 'Reset your password · Tuckline',
    canActivate: [guestGuard],
    loadComponent: () => import('./auth/reset-request/reset-request').then((m) => m.ResetRequest),
  },
  {
    path: 'reset-password/:token',
    title: 'Choose a new password · Tuckline',
    loadComponent: () => import('./auth/reset-confirm/reset-confirm').then((m) => m.ResetConfirm),
  },
  {
    // Public: the e-mailed link works signed in or not.
    path: 'invitations/:token',
    title: 'Invitation · Tuckline',
    loadComponent: () => import('./invitations/invitation-accept/invitation-accept').then((m) => m.InvitationAccept),
  },
  {
    path: '',
    canActivate: [authGuard],
    loadComponent: () => import('./shell/shell').then((m) => m.Shell),
    children: [
      { path: '', pathMatch: 'full', redirectTo: 'songs' },
      {
        path: 'songs',
        title: 'Songs · Tuckline',
        loadComponent: () => import('./songs/songs-list/songs-list').then((m) => m.SongsList),
      },
      {
        path: 'songs/:songId',
        title: 'Song · Tuckline',
        canDeactivate: [unsavedEditsGuard],
        loadComponent: () => import('./song/song-page/song-page').then((m) => m.SongPage),
      },
      {
        path: 'presets',
        title: 'Presets · Tuckline',
        loadComponent: () => import('./presets/presets-library/presets-library').then((m) => m.PresetsLibrary),
      },
      {
        path: 'presets/:presetId',
        title: 'Preset · Tuckline',
        loadComponent: () => import('./presets/preset-detail/preset-detail').then((m) => m.PresetDetail),
      },
      {
        path: 'team',
        title: 'Team · Tuckline',
        canActivate: [permissionGuard('manageMembers')],
        loadComponent: () => import('./team/team-members/team-members').then((m) => m.TeamMembers),
      },
      {
        path: 'audit',
        title: 'Audit trail · Tuckline',
        canActivate: [permissionGuard('viewAudit')],
        loadComponent: () => import('./audit/audit-trail/audit-trail').then((m) => m.AuditTrail),
      },
      {
        path: 'settings',
        title: 'Team settings · Tuckline',
        loadComponent: () => import('./team/team-settings/team-settings').then((m) => m.TeamSettings),
      },
    ],
  },
  { path: '**', redirectTo: 'songs' },
];
