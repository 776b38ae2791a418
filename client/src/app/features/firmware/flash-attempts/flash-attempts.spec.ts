import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { STATES } from '@domain/workflow';
import { TicketDetail } from '../../tickets/ticket.models';
import { FlashAttemptsView, TrackRecord } from '../firmware.models';
import { FlashAttempts, guessUnit } from './flash-attempts';

function ticket(extra: Partial<TicketDetail> = {}): TicketDetail {
  return {
    id: 9, tag: 'RW-0009', equipmentKind: 'transceiver', makeModel: 'Fenwick Heron 100 HF transceiver', ownerName: 'Tamsin Greave',
    state: 'reflash', stateSince: new Date().toISOString(), createdAt: '2026-11-29T02:59:00Z', version: 2, serialNumber: 'FH100-19260',
    units: ['display head', 'main body'], faultReported: 'Display dark.', symptoms: [], accessories: [], accessoriesNote: null, updatesBy: 'email', firmwareVersions: null, reflashConsent: true,
    notifyByEmail: true, ownerEmail: 'tamsin@kestrelfen.example', ownerPhone: null, ownerCallSign: null, technicianName: 'Tobin Marsh', technicianId: 3, previousState: 'diagnosis', undo: null,
    awaitingApproval: false, partsOnOrder: false, events: [], moves: STATES.map((to) => ({ to, allowed: false, reason: 'x' })),
    ...extra,
  };
}

const emptyView: FlashAttemptsView = { tag: 'RW-0009', reflashConsent: true, canRecord: true, reason: null, nextNumber: 1, attempts: [], unitFirmware: [] };
const record: TrackRecord = {
  model: 'Fenwick Heron 100 HF transceiver',
  unit: 'main_board',
  images: [
    { firmwareId: 4, version: '2.11', size: 133_120, sha256: 'a'.repeat(64), knownGood: true, withdrawn: false, withdrawnReason: null, attempts: 4, verified: 3, successRate: 0.75, lastUsedAt: '2026-11-01T10:00:00Z' },
    { firmwareId: 3, version: '2.10', size: 132_480, sha256: 'b'.repeat(64), knownGood: false, withdrawn: true, withdrawnReason: 'Recalled by the maker', attempts: 1, verified: 0, successRate: 0, lastUsedAt: null },
  ],
};

describe('guessUnit', () => {
  it('takes the display head only when the ticket names nothing else', () => {
    expect(guessUnit(['display head'])).toBe('display_head');
    expect(guessUnit(['display head', 'main body'])).toBe('main_board');
    expect(guessUnit(['transceiver'])).toBe('main_board');
  });
});

describe('FlashAttempts', () => {
  let fixture: ComponentFixture<FlashAttempts>;
  let http: HttpTestingController;
  let root: HTMLElement;

  async function setup(t: TicketDetail, view: FlashAttemptsView = emptyView) {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([])] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(FlashAttempts);
    fixture.componentRef.setInput('ticket', t);
    root = fixture.nativeElement;
    fixture.detectChanges();
    http.expectOne((r) => r.url === '/api/tickets/RW-0009/flash-attempts').flush(view);
    const tr = http.match((r) => r.url === '/api/firmware/track-record');
    for (const r of tr) r.flush({ ...record, unit: r.request.params.get('unit') });
    fixture.detectChanges();
    await fixture.whenStable();
    fixture.detectChanges();
  }

  afterEach(() => http.verify());

  it('shows the reflash cautions, offers only usable images with their record, and the transfer plan for the chosen one', async () => {
    await setup(ticket());
    const text = root.textContent ?? '';
    expect(text).toContain('Before you flash');
    expect(text).toContain('TTL-level adapter on an RS-232 port');
    expect(text).toContain('The maker’s procedure wins');
    expect(text).toContain('Follow local codes and licensed practice');
    // Withdrawn images are named, never offered.
    expect(root.querySelectorAll('mat-radio-button[data-testid^="image-"]').length).toBe(1);
    expect(text).toContain('Withdrawn, not offered');
    expect(text).toContain('4 attempts, 3 verified running · success 75 %');
    // 133,120 bytes in 128-byte blocks: 1040 blocks, no padding; 1040 × 133 + 1 = 138,321 bytes on
    // the wire; × 10 / 115200 = 12.007 s, so "at least 13 s" (worked by hand, Forsberg 1988 layout).
    const plan = root.querySelector('[data-testid="transfer-plan"]')?.textContent ?? '';
    expect(plan).toContain('at least 13 s');
    expect(plan).toContain('1040 blocks');
    expect(plan).toContain('138321 bytes on the wire');
  }, 30_000);

  it('sends the attempt as multipart with the serial settings, and reports the new attempt', async () => {
    await setup(ticket());
    const emitted = vi.fn();
    fixture.componentInstance.recorded.subscribe(emitted);
    const c = fixture.componentInstance as unknown as { form: { patchValue(v: object): void }; submit(): void };
    c.form.patchValue({ port: 'COM3', outcome: 'transfer_failed', failedAtBlock: 261, notes: 'Supply dipped.' });
    c.submit();
    const req = http.expectOne((r) => r.method === 'POST' && r.url === '/api/tickets/RW-0009/flash-attempts');
    const body = req.request.body as FormData;
    expect(body.get('firmwareId')).toBe('4');
    expect(body.get('unit')).toBe('main_board');
    expect(body.get('baud')).toBe('115200');
    expect(body.get('parity')).toBe('none');
    expect(body.get('failedAtBlock')).toBe('261');
    req.flush({
      ...emptyView,
      nextNumber: 2,
      attempts: [{
        number: 1, unit: 'main_board', firmware: { id: 4, model: record.model, version: '2.11', size: 133_120, sha256: 'a'.repeat(64), withdrawn: false },
        serial: { port: 'COM3', baud: 115200, dataBits: 8, parity: 'none', stopBits: '1', block: 128, check: 'crc' }, outcome: 'transfer_failed',
        failedAtBlock: 261, blocks: 1040, failedAtPercent: 25, notes: 'Supply dipped.', serialLog: null, logMatches: [], technicianName: 'Tobin Marsh', at: '2026-12-02T03:00:00Z',
      }],
    });
    fixture.detectChanges();
    for (const r of http.match((r) => r.url === '/api/firmware/track-record')) r.flush(record);
    fixture.detectChanges();
    expect(emitted).toHaveBeenCalled();
    expect(root.textContent).toContain('Attempt 1 recorded: Transfer failed.');
    expect(root.textContent).toContain('at block 261 of 1040 (25 % sent)');
  }, 30_000);

  it('refuses to send a failed transfer without its block', async () => {
    await setup(ticket());
    const c = fixture.componentInstance as unknown as { form: { patchValue(v: object): void }; submit(): void };
    c.form.patchValue({ port: 'COM3', outcome: 'transfer_failed' });
    fixture.detectChanges(); // the block field appears once the outcome is chosen
    c.submit();
    fixture.detectChanges();
    await fixture.whenStable();
    fixture.detectChanges();
    http.expectNone((r) => r.method === 'POST');
    expect(root.textContent).toContain('Give the failed block, 1 to 1040.');
  }, 30_000);

  it('says why attempts cannot be recorded without consent', async () => {
    await setup(ticket({ reflashConsent: false }), { ...emptyView, reflashConsent: false, canRecord: false, reason: 'The owner has not consented to a reflash.' });
    expect(root.querySelector('form')).toBeNull();
    expect(root.textContent).toContain('The owner has not consented to a reflash.');
  }, 30_000);
});
