import { BreakpointObserver } from '@angular/cdk/layout';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatChipsModule } from '@angular/material/chips';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatListModule } from '@angular/material/list';
import { MatMenuModule } from '@angular/material/menu';
import { MatSelectModule } from '@angular/material/select';
import { MatSidenavModule } from '@angular/material/sidenav';
import { MatToolbarModule } from '@angular/material/toolbar';
import { MatTooltipModule } from '@angular/material/tooltip';
import { Router, RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { map } from 'rxjs';
import { AuthService } from '../core/auth/auth.service';
import { ThemeService } from '../core/theme/theme.service';
import { Icon } from '../ui/icon/icon';
import { RoleChip } from '../ui/role-chip/role-chip';
import { navItemsFor } from './nav-items';

@Component({
  selector: 'tl-shell',
  imports: [
    RouterOutlet,
    RouterLink,
    RouterLinkActive,
    MatToolbarModule,
    MatSidenavModule,
    MatListModule,
    MatButtonModule,
    MatMenuModule,
    MatSelectModule,
    MatFormFieldModule,
    MatChipsModule,
    MatTooltipModule,
    Icon,
    RoleChip,
  ],
  templateUrl: './shell.html',
  styleUrl: './shell.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Shell {
  private readonly auth = inject(AuthService);
  private readonly router = inject(Router);
  private readonly themes = inject(ThemeService);

  protected readonly narrow = toSignal(
    inject(BreakpointObserver).observe('(max-width: 840px)').pipe(map((state) => state.matches)),
    { initialValue: false },
  );
  protected readonly user = this.auth.user;
  protected readonly teams = this.auth.teams;
  protected readonly team = this.auth.team;
  protected readonly role = this.auth.role;
  protected readonly navItems = computed(() => navItemsFor(this.role()));
  protected readonly theme = this.themes.theme;

  protected switchTeam(teamId: string): void {
    this.auth.chooseTeam(teamId);
    void this.router.navigate(['/songs']);
  }

  protected toggleTheme(): void {
    this.themes.toggle();
  }

  protected signOut(): void {
    this.auth.signOut().subscribe(() => void this.router.navigate(['/sign-in']));
  }
}
