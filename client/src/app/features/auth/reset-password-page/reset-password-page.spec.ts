import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { ResetPasswordPage } from './reset-password-page';

describe('ResetPasswordPage', () => {
  function setup(token?: string) {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([])] });
    const fixture = TestBed.createComponent(ResetPasswordPage);
    if (token) fixture.componentRef.setInput('token', token);
    fixture.detectChanges();
    return { root: fixture.nativeElement as HTMLElement, http: TestBed.inject(HttpTestingController) };
  }

  it('without a token says so at once, offers a new link, and shows no form', () => {
    const { root, http } = setup();
    expect(root.querySelector('[role="alert"]')?.textContent).toContain('this address has no token in it');
    const ask = [...root.querySelectorAll('a')].find((a) => a.textContent?.trim() === 'Ask for a new link');
    expect(ask?.getAttribute('href')).toBe('/forgot-password');
    expect(root.querySelector('form')).toBeNull();
    http.verify();
  });

  it('with a token shows the new-password form and its hint', () => {
    const { root } = setup('abc-123');
    expect(root.querySelector('[role="alert"]')).toBeNull();
    expect(root.querySelector('input[type="password"]')).not.toBeNull();
    expect(root.querySelector('mat-hint')?.textContent).toContain('At least 8 characters');
  });
});
