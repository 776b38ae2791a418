import { HttpClient, HttpContext, provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { SessionStore } from '../auth/session-store';
import { Notifier } from '../notifier';
import { HANDLES_OWN_ERRORS, SESSION_ENDS_ON_401 } from './api-error';
import { errorInterceptor } from './error-interceptor';

describe('errorInterceptor', () => {
  let http: HttpClient;
  let backend: HttpTestingController;
  let notifier: { info: ReturnType<typeof vi.fn>; error: ReturnType<typeof vi.fn> };
  let navigate: ReturnType<typeof vi.spyOn>;

  beforeEach(() => {
    notifier = { info: vi.fn(), error: vi.fn() };
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(withInterceptors([errorInterceptor])),
        provideHttpClientTesting(),
        provideRouter([]),
        { provide: Notifier, useValue: notifier },
      ],
    });
    http = TestBed.inject(HttpClient);
    backend = TestBed.inject(HttpTestingController);
    navigate = vi.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    TestBed.inject(SessionStore).set({ id: 1, email: 'a@kestrelfen.example', displayName: 'A', callSign: null, roles: ['member'] });
  });

  afterEach(() => backend.verify());

  it('shows a non-field error in the snack bar and still fails the call', () => {
    const failed = vi.fn();
    http.get('/api/tickets/RW-0009').subscribe({ error: failed });
    backend
      .expectOne('/api/tickets/RW-0009')
      .flush({ error: { code: 'not_found', message: 'No ticket RW-0009.' } }, { status: 404, statusText: 'Not Found' });
    expect(notifier.error).toHaveBeenCalledWith('No ticket RW-0009.');
    expect(failed).toHaveBeenCalledTimes(1);
  });

  it('leaves field errors to the form', () => {
    http.post('/api/users', {}).subscribe({ error: () => undefined });
    backend
      .expectOne('/api/users')
      .flush({ error: { code: 'validation_failed', message: 'Check the form.', fields: { email: 'Bad.' } } }, { status: 400, statusText: 'Bad Request' });
    expect(notifier.error).not.toHaveBeenCalled();
  });

  it('on 401 ends the session and sends the person to sign in', () => {
    http.get('/api/board').subscribe({ error: () => undefined });
    backend
      .expectOne('/api/board')
      .flush({ error: { code: 'unauthenticated', message: 'Sign in first.' } }, { status: 401, statusText: 'Unauthorized' });
    expect(TestBed.inject(SessionStore).signedIn()).toBe(false);
    expect(navigate).toHaveBeenCalledWith(['/sign-in'], expect.anything());
    expect(notifier.info).toHaveBeenCalledWith('Your session has ended. Sign in again to carry on.');
  });

  it('stays quiet for requests whose caller handles errors', () => {
    http
      .get('/api/x', { context: new HttpContext().set(HANDLES_OWN_ERRORS, true) })
      .subscribe({ error: () => undefined });
    backend.expectOne('/api/x').flush({ error: { code: 'c', message: 'm' } }, { status: 409, statusText: 'Conflict' });
    expect(notifier.error).not.toHaveBeenCalled();
    expect(navigate).not.toHaveBeenCalled();
  });

  it('a 401 on a request marked SESSION_ENDS_ON_401 (a move mid-drag) still sends the person to sign in; its other errors stay with the caller', () => {
    const context = () => new HttpContext().set(HANDLES_OWN_ERRORS, true).set(SESSION_ENDS_ON_401, true);
    http.post('/api/tickets/RW-0001/moves', {}, { context: context() }).subscribe({ error: () => undefined });
    backend
      .expectOne('/api/tickets/RW-0001/moves')
      .flush({ error: { code: 'stale_version', message: 'Someone else moved it.' } }, { status: 409, statusText: 'Conflict' });
    expect(notifier.error).not.toHaveBeenCalled();
    expect(navigate).not.toHaveBeenCalled();

    const failed = vi.fn();
    http.post('/api/tickets/RW-0001/moves', {}, { context: context() }).subscribe({ error: failed });
    backend
      .expectOne('/api/tickets/RW-0001/moves')
      .flush({ error: { code: 'not_signed_in', message: 'Sign in to continue.' } }, { status: 401, statusText: 'Unauthorized' });
    expect(TestBed.inject(SessionStore).signedIn()).toBe(false);
    expect(navigate).toHaveBeenCalledWith(['/sign-in'], expect.anything());
    expect(failed).toHaveBeenCalledTimes(1);
  });

  it('words a network failure without a body', () => {
    http.get('/api/y').subscribe({ error: () => undefined });
    backend.expectOne('/api/y').error(new ProgressEvent('error'), { status: 0 });
    expect(notifier.error).toHaveBeenCalledWith('The bench server cannot be reached. Check the connection and try again.');
  });
});
