// Storage for uploaded bytes behind one small interface, so that the local folder used on one
// machine can be swapped for S3-compatible object storage when the club outgrows it (brief §10).
// Objects are content-addressed: the key is the SHA-256 of the bytes, in lower-case hex, so equal
// bytes are stored once and a key always names exactly one content.
import type { Readable, Writable } from 'node:stream';

/** Bytes being written; invisible to readers until commit(). */
export interface StagedBlob {
  /** Write the bytes here (pipe into it). */
  readonly stream: Writable;
  /** Makes the staged bytes the object `key` (a SHA-256 hex). If it already exists, the staged copy is dropped. */
  commit(key: string): Promise<void>;
  /** Drops the staged bytes; a no-op after commit() or a second call. */
  discard(): Promise<void>;
}

export interface BlobStore {
  stage(): StagedBlob;
  has(key: string): Promise<boolean>;
  /** The object's bytes; throws if it does not exist. */
  read(key: string): Promise<Readable>;
}

const KEY = /^[0-9a-f]{64}$/;

/** Keys are server-computed SHA-256 hex; anything else (a path, a traversal attempt) is refused. */
export function assertBlobKey(key: string): void {
  if (!KEY.test(key)) throw new Error('A blob key is 64 lower-case hex digits (a SHA-256).');
}
