// Where uploaded files live, behind a small interface so another store (an object store) can
// replace the local folder. Keys are made by Benchcall, never from a user's file name.
import { join } from 'node:path';
import { env } from '$env/dynamic/private';
import { localDiskStorage, type FileStorage } from './storage-disk';

export { isStorageKey, localDiskStorage, type FileStorage } from './storage-disk';

let shared: FileStorage | null = null;

/** The app's uploads: BENCHCALL_UPLOADS_DIR, by default .data/uploads. */
export function uploads(): FileStorage {
	shared ??= localDiskStorage(env.BENCHCALL_UPLOADS_DIR || join('.data', 'uploads'));
	return shared;
}
