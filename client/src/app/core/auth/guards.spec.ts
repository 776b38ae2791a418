import { Component } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { Role } from './auth.models';
import { homeRedirect, roleGuard, signedInGuard } from './guards';
import { SessionStore } from './session-store';

@Component({ template: '' })
class Blank {}

describe('route guards', () => {
  function setup(roles: Role[] | null) {
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideRouter([
          { path: '', pathMatch: 'full', redirectTo: homeRedirect },
          { path: 'sign-in', component: Blank },
          { path: 'board', component: Blank, canActivate: [roleGuard('technician', 'admin')] },
          { path: 'tickets', component: Blank, canActivate: [signedInGuard] },
        ]),
      ],
    });
    if (roles) {
      TestBed.inject(SessionStore).set({ id: 1, email: 'x@kestrelfen.example', displayName: 'X', callSign: null, roles });
    }
    return TestBed.inject(Router);
  }

  it('home sends technicians to the board and members to their tickets', async () => {
    const router = setup(['technician']);
    await router.navigateByUrl('/');
    expect(router.url).toBe('/board');
    TestBed.resetTestingModule();
    const router2 = setup(['member']);
    await router2.navigateByUrl('/');
    expect(router2.url).toBe('/tickets');
  });

  it('a member asking for the board goes home instead', async () => {
    const router = setup(['member']);
    await router.navigateByUrl('/board');
    expect(router.url).toBe('/tickets');
  });

  it('signed out, pages send to sign in with the way back', async () => {
    const router = setup(null);
    await router.navigateByUrl('/tickets');
    expect(router.url).toBe('/sign-in?next=%2Ftickets');
  });
});
