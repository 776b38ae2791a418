// The Flasher page with the HTTP layer faked: only usable images offered and the SHA-256 checked
// before anything can be sent (a mismatch stops), and a run left unsaved by an earlier visit offered,
// kept through a failed save, and saved as a flash attempt.
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { ActivatedRoute, convertToParamMap, provideRouter } from '@angular/router';
import { STATES } from '@domain/workflow';
import { of } from 'rxjs';
import type { TicketDetail } from '../../tickets/ticket.models';
import type { FlashAttemptsView, TrackRecord } from '../../firmware/firmware.models';
import { PENDING_RUN_KEY, type PendingRun } from '../flasher-record';
import { DEFAULT_SERIAL_SETTINGS } from '../serial-link';
import { FlasherPage } from './flasher-page';

// FIPS 180-4 example: SHA-256("abc").
const ABC_SHA256 = 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad';

const ticket: TicketDetail = {
  id: 42, tag: 'RW-0042', equipmentKind: 'transceiver', makeModel: 'Fenwick Kestrel 7', ownerName: 'Ivo Lindqvist',
  state: 'reflash', stateSince: '2026-12-01T19:00:00Z', createdAt: '2026-11-29T02:59:00Z', version: 3, serialNumber: null,
  units: ['display head'], faultReported: 'Display dark.', symptoms: ['display_dark'], accessoriesNote: null, updatesBy: 'none', technicianId: 3, previousState: 'diagnosis', undo: null, accessories: [], firmwareVersions: null, reflashConsent: true,
  notifyByEmail: false, ownerEmail: 'ivo@fenmail.example', ownerPhone: null, ownerCallSign: null, technicianName: 'Tobin Marsh',
  awaitingApproval: false, partsOnOrder: false, events: [], moves: STATES.map((to) => ({ to, allowed: false, reason: 'x' })),
};
const view: FlashAttemptsView = { tag: 'RW-0042', reflashConsent: true, canRecord: true, reason: null, nextNumber: 1, attempts: [], unitFirmware: [] };
const row = { size: 3, knownGood: false, withdrawnReason: null, attempts: 0, verified: 0, successRate: null, lastUsedAt: null };

function record(sha256: string): TrackRecord {
  return {
    model: 'Fenwick Kestrel 7',
    unit: 'display_head',
    images: [
      { ...row, firmwareId: 7, version: '2.40', sha256, withdrawn: false },
      { ...row, firmwareId: 6, version: '2.38', sha256: 'c'.repeat(64), withdrawn: true, withdrawnReason: 'Recalled' },
    ],
  };
}

describe('FlasherPage', () => {
  let fixture: ComponentFixture<FlasherPage>;
  let http: HttpTestingController;
  let root: HTMLElement;

  function setup(tag: string | null) {
    const params = convertToParamMap(tag ? { ticket: tag } : {});
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideRouter([]),
        { provide: ActivatedRoute, useValue: { snapshot: { queryParamMap: params }, queryParamMap: of(params) } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(FlasherPage);
    root = fixture.nativeElement;
    fixture.detectChanges();
    http.expectOne((r) => r.url === '/api/tickets' && r.params.get('state') === 'reflash').flush({ items: [], total: 0, page: 1, pageSize: 100 });
  }

  /** Lets signals, resources and SubtleCrypto run (not whenStable: an open request keeps the app unstable). */
  async function settle() {
    for (let i = 0; i < 6; i++) {
      fixture.detectChanges();
      await new Promise((r) => setTimeout(r, 20));
    }
    fixture.detectChanges();
  }

  const sendButton = () => [...root.querySelectorAll('button')].find((b) => b.textContent?.includes('Send the image')) as HTMLButtonElement;

  async function openTicketWithImage(librarySha: string) {
    setup('RW-0042');
    http.expectOne('/api/tickets/RW-0042').flush(ticket);
    http.expectOne((r) => r.url === '/api/tickets/RW-0042/flash-attempts').flush(view);
    await settle();
    const tr = http.expectOne((r) => r.url === '/api/firmware/track-record');
    expect(tr.request.params.get('unit')).toBe('display_head');
    expect(tr.request.params.get('model')).toBe('Fenwick Kestrel 7');
    tr.flush(record(librarySha));
    await settle();
    const abc = new ArrayBuffer(3);
    new Uint8Array(abc).set([0x61, 0x62, 0x63]); // "abc"
    http.expectOne('/api/firmware/7/download').flush(abc);
    await settle();
  }

  afterEach(() => {
    http.verify();
    localStorage.clear();
  });

  it('offers only the usable image, checks its SHA-256 in the browser, and says so', async () => {
    await openTicketWithImage(ABC_SHA256);
    expect(root.querySelector('[data-testid="flasher-image-2.40"]')).not.toBeNull();
    expect(root.querySelector('[data-testid="flasher-image-2.38"]')).toBeNull();
    expect(root.textContent).toContain('1 withdrawn image(s) not offered');
    expect(root.querySelector('[data-testid="image-check"]')?.textContent).toContain('SHA-256 ba7816bf8f01cfea… matches the library');
    // Checked, but no port is open yet.
    expect(sendButton().disabled).toBe(true);
    expect(root.textContent).toContain('Open the port first.');
  }, 30_000);

  it('a SHA-256 mismatch stops: it is said plainly and nothing can be sent', async () => {
    await openTicketWithImage('d'.repeat(64));
    const check = root.querySelector('[data-testid="image-check"]')?.textContent ?? '';
    expect(check).toContain('does not match the library');
    expect(check).toContain('Nothing was sent to the unit.');
    expect(sendButton().disabled).toBe(true);
    expect(root.textContent).toContain('Choose a checked image first.');
  }, 30_000);

  it('a run left unsaved is offered on the next visit, kept through a failed save, then saved as a flash attempt', async () => {
    const kept: PendingRun = {
      v: 1, tag: 'RW-0042', unit: 'display_head', firmwareId: 7, imageVersion: '2.40', blocks: 8, port: 'Practice unit (simulated, no radio)',
      settings: { ...DEFAULT_SERIAL_SETTINGS }, block: 1024, check: 'crc', startedAt: '2026-12-02T19:04:05.000Z', elapsedMs: 2100,
      acknowledged: 3, phase: 'sending', retries: [], outcome: null, planSeconds: 0.71, log: 'Stopped in the loader.\n',
    };
    localStorage.setItem(PENDING_RUN_KEY, JSON.stringify(kept));
    setup(null);
    await settle();
    const banner = root.querySelector('[data-testid="unsaved-run"]');
    expect(banner?.textContent).toContain('An unsaved run on RW-0042 was kept in this browser.');
    expect(banner?.textContent).toContain('3 of 8 blocks acknowledged');
    const saveButton = () => [...root.querySelectorAll('button')].find((b) => b.textContent?.includes('Save it as a flash attempt')) as HTMLButtonElement;

    saveButton().click();
    let post = http.expectOne((r) => r.method === 'POST' && r.url === '/api/tickets/RW-0042/flash-attempts');
    const body = post.request.body as FormData;
    expect(body.get('outcome')).toBe('transfer_failed');
    expect(body.get('failedAtBlock')).toBe('4');
    expect(body.get('firmwareId')).toBe('7');
    expect(body.get('block')).toBe('1024');
    expect(String(body.get('notes'))).toContain('reloaded or closed during the run');
    expect(await (body.get('serialLog') as File).text()).toBe('Stopped in the loader.\n');
    post.flush({ error: { code: 'unavailable', message: 'The database is not answering.' } }, { status: 503, statusText: 'Service Unavailable' });
    await settle();
    expect(root.textContent).toContain('The run could not be saved');
    expect(localStorage.getItem(PENDING_RUN_KEY)).not.toBeNull();

    saveButton().click();
    post = http.expectOne((r) => r.method === 'POST' && r.url === '/api/tickets/RW-0042/flash-attempts');
    post.flush({ ...view, attempts: [{ number: 1, outcome: 'transfer_failed' }] });
    await settle();
    expect(localStorage.getItem(PENDING_RUN_KEY)).toBeNull();
    expect(root.querySelector('[data-testid="unsaved-run"]')).toBeNull();
    expect(root.querySelector('[data-testid="saved-attempt"]')?.textContent).toContain('Saved as attempt 1 on RW-0042: Transfer failed.');
  }, 30_000);
});
