import { createHash } from 'node:crypto';
import { createWriteStream } from 'node:fs';
import type { Request } from 'express';
import type { StorageEngine } from 'multer';
import type { FileStore } from './file-store';

export interface HashedFile extends Express.Multer.File {
  sha256: string;
}

/**
 * A multer storage engine that streams the upload to a temporary file in the
 * store while hashing it, so a large stem never sits in memory. multer calls
 * `_removeFile` when the request fails or is aborted, which deletes the part.
 */
export function hashingStorage(store: FileStore): StorageEngine {
  return {
    _handleFile(_req: Request, file, callback) {
      const path = store.tempPath();
      const hash = createHash('sha256');
      const out = createWriteStream(path);
      let size = 0;
      file.stream.on('data', (chunk: Buffer) => {
        hash.update(chunk);
        size += chunk.length;
      });
      file.stream.on('error', (error) => {
        out.destroy();
        void store.removeTemp(path);
        callback(error);
      });
      out.on('error', (error) => callback(error));
      out.on('finish', () => callback(null, { path, size, sha256: hash.digest('hex') } as Partial<HashedFile>));
      file.stream.pipe(out);
    },
    _removeFile(_req, file, callback) {
      store.removeTemp(file.path).then(() => callback(null), callback);
    },
  };
}
