import { Injectable, computed, inject, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import { AuthApi } from './auth-api';
import { Role, User } from './auth.models';

/** Who is signed in. Loaded once at start (which also gets the XSRF cookie), then kept in a signal. */
@Injectable({ providedIn: 'root' })
export class SessionStore {
  private readonly api = inject(AuthApi);
  private readonly current = signal<User | null>(null);

  readonly user = this.current.asReadonly();
  readonly signedIn = computed(() => this.current() !== null);
  readonly roles = computed<readonly Role[]>(() => this.current()?.roles ?? []);
  /** Technicians and admins work the Bench board. */
  readonly worksTheBench = computed(() => this.hasAnyRole('technician', 'admin'));

  hasAnyRole(...roles: Role[]): boolean {
    const mine = this.roles();
    return roles.some((r) => mine.includes(r));
  }

  /** Asks the server who we are. Never fails: an unreachable server counts as signed out. */
  async load(): Promise<void> {
    try {
      const { user } = await firstValueFrom(this.api.session());
      this.current.set(user);
    } catch {
      this.current.set(null);
    }
  }

  set(user: User): void {
    this.current.set(user);
  }

  clear(): void {
    this.current.set(null);
  }
}
