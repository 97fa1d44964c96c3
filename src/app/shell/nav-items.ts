import { Role, can } from '../../../shared/schemas/team';
import { IconName } from '../ui/icon/icons';

export interface NavItem {
  path: string;
  label: string;
  icon: IconName;
}

/** The app's sections a role may open: Team is for those who manage members. */
export function navItemsFor(role: Role | null): NavItem[] {
  const items: NavItem[] = [{ path: '/songs', label: 'Songs', icon: 'songs' }];
  if (role && can(role, 'manageMembers')) items.push({ path: '/team', label: 'Team', icon: 'team' });
  return items;
}
