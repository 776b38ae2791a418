import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { FirmwareImage } from '../firmware.models';
import { LibraryPage } from './library-page';

const image: FirmwareImage = {
  id: 4, model: 'Fenwick Heron 100 HF transceiver', unit: 'main_board', version: '2.11', size: 133_120,
  checksums: { sha256: '1a39483cdab6'.padEnd(64, '0'), crc32: '8cdb1722', crc16Xmodem: '56b2' }, releaseNotes: null, source: null,
  originalName: 'heron.bin', makerChecksumKind: null, status: 'withdrawn', knownGood: false, withdrawnAt: '2026-11-01T00:00:00Z',
  withdrawnReason: 'Recalled', uploadedByName: 'Tobin Marsh', createdAt: '2026-10-03T02:59:00Z',
};

describe('LibraryPage', () => {
  it('lists images with status in words, and asks the server for sorted pages', async () => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([])] });
    const http = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(LibraryPage);
    fixture.detectChanges();
    http.match('/api/firmware/models').forEach((r) => r.flush({ models: [] }));
    const first = http.expectOne((r) => r.url === '/api/firmware');
    expect(first.request.params.get('sort')).toBe('createdAt');
    expect(first.request.params.get('dir')).toBe('desc');
    first.flush({ items: [image], total: 30, page: 1, pageSize: 25 });
    await fixture.whenStable();
    fixture.detectChanges();
    const root: HTMLElement = fixture.nativeElement;
    expect(root.textContent).toContain('Fenwick Heron 100 HF transceiver');
    expect(root.textContent).toContain('Withdrawn');
    expect(root.textContent).toContain('130.0 KiB');
    expect(root.querySelector('a[download]')?.getAttribute('href')).toBe('/api/firmware/4/download');

    (fixture.componentInstance as unknown as { sorted(s: { active: string; direction: string }): void }).sorted({ active: 'version', direction: 'asc' });
    fixture.detectChanges();
    const sorted = http.expectOne((r) => r.url === '/api/firmware');
    expect(sorted.request.params.get('sort')).toBe('version');
    expect(sorted.request.params.get('dir')).toBe('asc');
    sorted.flush({ items: [], total: 0, page: 1, pageSize: 25 });
    fixture.detectChanges();
    http.match('/api/firmware/models').forEach((r) => r.flush({ models: [] }));
    http.verify();
  }, 30_000);
});
