// BlobStore on a local folder (the default): <root>/blobs/ab/cd/<sha256>, staged writes in
// <root>/staging/<random> renamed into place on commit (same file system, so the rename is atomic
// and a reader never sees half an object). The folder is outside any static root: app.ts serves
// only the built client's folder, and nothing here is named by the client.
import { randomUUID } from 'node:crypto';
import { createReadStream, createWriteStream, mkdirSync } from 'node:fs';
import { access, mkdir, open, rename, rm } from 'node:fs/promises';
import path from 'node:path';
import type { Readable } from 'node:stream';
import { assertBlobKey, type BlobStore, type StagedBlob } from './blob-store';

export class LocalFolderStore implements BlobStore {
  private readonly staging: string;
  private readonly blobs: string;

  constructor(readonly root: string) {
    this.staging = path.join(root, 'staging');
    this.blobs = path.join(root, 'blobs');
    mkdirSync(this.staging, { recursive: true });
    mkdirSync(this.blobs, { recursive: true });
  }

  private pathOf(key: string): string {
    assertBlobKey(key);
    return path.join(this.blobs, key.slice(0, 2), key.slice(2, 4), key);
  }

  stage(): StagedBlob {
    const tmp = path.join(this.staging, randomUUID());
    const stream = createWriteStream(tmp, { flags: 'wx', highWaterMark: 256 * 1024 });
    let settled = false;
    return {
      stream,
      commit: async (key) => {
        if (settled) throw new Error('This staged blob was already committed or discarded.');
        const target = this.pathOf(key);
        // Durable before it becomes visible: the row that names it commits right after.
        const fh = await open(tmp, 'r+');
        try {
          await fh.sync();
        } finally {
          await fh.close();
        }
        await mkdir(path.dirname(target), { recursive: true });
        settled = true;
        if (await this.exists(target)) {
          await rm(tmp, { force: true }); // same key, same bytes
          return;
        }
        await rename(tmp, target);
      },
      discard: async () => {
        if (settled) return;
        settled = true;
        if (!stream.closed) {
          stream.destroy();
          await new Promise<void>((resolve) => (stream.closed ? resolve() : stream.once('close', () => resolve())));
        }
        await rm(tmp, { force: true });
      },
    };
  }

  private async exists(file: string): Promise<boolean> {
    try {
      await access(file);
      return true;
    } catch {
      return false;
    }
  }

  has(key: string): Promise<boolean> {
    return this.exists(this.pathOf(key));
  }

  async read(key: string): Promise<Readable> {
    const file = this.pathOf(key);
    if (!(await this.exists(file))) throw new Error(`Blob ${key} is missing from ${this.blobs}.`);
    return createReadStream(file);
  }
}
