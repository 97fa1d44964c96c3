import { randomUUID } from 'node:crypto';
import { createReadStream, mkdirSync } from 'node:fs';
import { rename, rm, stat, writeFile } from 'node:fs/promises';
import { dirname, join, normalize, sep } from 'node:path';

/**
 * Stored files (stems, overviews, exports) on local disk under the data folder.
 * Keys are relative paths we generate; nothing a client sends becomes a path.
 */
export function createFileStore(root: string) {
  const tmpDir = join(root, 'tmp');
  mkdirSync(tmpDir, { recursive: true });

  function pathOf(key: string): string {
    const path = normalize(join(root, key));
    if (!path.startsWith(root + sep)) throw new Error(`Storage key escapes the store: ${key}`);
    return path;
  }

  return {
    root,
    tmpDir,
    pathOf,
    /** A fresh temporary path inside the store (same file system, so `adopt` is a rename). */
    tempPath(ext = ''): string {
      return join(tmpDir, `${randomUUID()}${ext}`);
    },
    /** Moves a finished temporary file to its key. */
    async adopt(tempPath: string, key: string): Promise<void> {
      const target = pathOf(key);
      mkdirSync(dirname(target), { recursive: true });
      await rename(tempPath, target);
    },
    async put(key: string, data: Uint8Array | string): Promise<number> {
      const target = pathOf(key);
      mkdirSync(dirname(target), { recursive: true });
      const temp = join(tmpDir, randomUUID());
      await writeFile(temp, data);
      await rename(temp, target);
      return typeof data === 'string' ? Buffer.byteLength(data) : data.byteLength;
    },
    async size(key: string): Promise<number> {
      return (await stat(pathOf(key))).size;
    },
    read(key: string) {
      return createReadStream(pathOf(key));
    },
    async remove(key: string): Promise<void> {
      await rm(pathOf(key), { force: true });
    },
    async removeTemp(path: string): Promise<void> {
      if (path.startsWith(tmpDir + sep)) await rm(path, { force: true });
    },
  };
}
export type FileStore = ReturnType<typeof createFileStore>;
