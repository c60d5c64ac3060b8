// Files in a folder on this machine, behind the FileStorage interface. Free of SvelteKit imports
// so that scripts (photos:thumbs) use the same store as the app (storage.ts).
import { access, mkdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import { dirname, join, resolve } from 'node:path';

export interface FileStorage {
	put(key: string, bytes: Uint8Array): Promise<void>;
	/** The bytes, or null when there is no such file. */
	get(key: string): Promise<Uint8Array | null>;
	remove(key: string): Promise<void>;
	/** Whether there is a file under the key, without reading it (optional: `get` answers too). */
	exists?(key: string): Promise<boolean>;
}

/** Keys look like `<shop uuid>/<uuid>.<ext>`: nothing else reaches the disk. */
const KEY_RE = /^[0-9a-f-]{36}\/[0-9a-f-]{36}\.[a-z0-9]{1,5}$/;

export function isStorageKey(key: string): boolean {
	return KEY_RE.test(key);
}

/** Files in a folder on this machine. */
export function localDiskStorage(root: string): FileStorage {
	const base = resolve(root);
	const pathOf = (key: string) => {
		if (!isStorageKey(key)) throw new Error(`Not a storage key: ${key.slice(0, 80)}`);
		return join(base, key);
	};
	return {
		async put(key, bytes) {
			const path = pathOf(key);
			await mkdir(dirname(path), { recursive: true });
			// write then rename, so a reader never sees half a file
			const tmp = `${path}.${process.pid}.part`;
			await writeFile(tmp, bytes);
			await rename(tmp, path);
		},
		async get(key) {
			try {
				return new Uint8Array(await readFile(pathOf(key)));
			} catch (e) {
				if ((e as NodeJS.ErrnoException).code === 'ENOENT') return null;
				throw e;
			}
		},
		async remove(key) {
			await rm(pathOf(key), { force: true });
		},
		async exists(key) {
			return access(pathOf(key)).then(
				() => true,
				() => false
			);
		}
	};
}
