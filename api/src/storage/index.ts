// Which BlobStore the API uses. Today: the local folder, one subfolder per database so that the
// test and browser-test databases never share files with the demo club's.
import path from 'node:path';
import type { Config } from '../config';
import type { BlobStore } from './blob-store';
import { LocalFolderStore } from './local-folder-store';

export type { BlobStore, StagedBlob } from './blob-store';

const stores = new Map<string, BlobStore>();

/** One store per area (firmware images, ticket photos), each in its own folder. */
export function blobStoreFor(config: Pick<Config, 'RW_STORAGE_DIR' | 'RW_DB_NAME'>, area: 'firmware' | 'photos' = 'firmware'): BlobStore {
  const root = path.resolve(config.RW_STORAGE_DIR, config.RW_DB_NAME, area);
  let store = stores.get(root);
  if (!store) {
    store = new LocalFolderStore(root);
    stores.set(root, store);
  }
  return store;
}
