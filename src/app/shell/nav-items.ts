import { Role, can } from '../../../shared/schemas/team';
import { IconName } from '../ui/icon/icons';

export interface NavItem {
  path: string;
  label: string;
  icon: IconName;
}

/** The app's sections a role may open: Team and the audit trail are for owners; everyone reads the settings. */
export function navItemsFor(role: Role | null): NavItem[] {
  const items: NavItem[] = [
    { path: '/songs', label: 'Songs', icon: 'songs' },
    { path: '/presets', label: 'Presets', icon: 'presets' },
  ];
  if (role && can(role, 'manageMembers')) items.push({ path: '/team', label: 'Team', icon: 'team' });
  if (role && can(role, 'viewAudit')) items.push({ path: '/audit', label: 'Audit trail', icon: 'audit' });
  if (role) items.push({ path: '/settings', label: 'Settings', icon: 'settings' });
  return items;
}
