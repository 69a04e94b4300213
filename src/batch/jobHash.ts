import { createHash } from 'node:crypto';
import { createReadStream, promises as fsp } from 'node:fs';
import type { BatchJob } from './manifest.js';

/** What is known of one input when the hash was taken. */
export interface InputDigest {
  path: string;
  /** SHA-256 of the content, or `absent` / `unreadable` / `folder` / `special` (FIFO, device). */
  sha256: string;
}

/** File digests already computed in this process, keyed by path, size, mtime and inode. */
export type DigestCache = Map<string, Promise<string>>;

/**
 * The content hash that decides whether a job must run again: SHA-256 over the job's resolved
 * command line and the SHA-256 of every input file. Pass one `cache` to many calls so files shared
 * by many jobs are read once.
 */
export async function jobHash(job: BatchJob, cache: DigestCache = new Map()): Promise<{ hash: string; inputs: InputDigest[] }> {
  const inputs: InputDigest[] = [];
  for (const path of job.inputs) inputs.push({ path, sha256: await fileDigest(path, cache) });
  const h = createHash('sha256');
  h.update(JSON.stringify({ argv: job.argv, inputs }));
  return { hash: h.digest('hex'), inputs };
}

async function fileDigest(path: string, cache: DigestCache): Promise<string> {
  let st;
  try {
    st = await fsp.stat(path);
  } catch {
    // The job will fail to read it and say so; the hash only needs to differ once it appears.
    return 'absent';
  }
  if (st.isDirectory()) return 'folder';
  // Reading a FIFO or device would consume or block on what the job itself must read.
  if (!st.isFile()) return 'special';
  const key = `${path}\0${st.size}\0${st.mtimeMs}\0${st.ino}`;
  let p = cache.get(key);
  if (!p) {
    p = sha256File(path).catch(() => 'unreadable');
    cache.set(key, p);
  }
  return p;
}

/** SHA-256 of a file's content, streamed. */
export function sha256File(path: string): Promise<string> {
  return new Promise((resolveHash, reject) => {
    const h = createHash('sha256');
    createReadStream(path)
      .on('data', (chunk) => h.update(chunk))
      .on('error', reject)
      .on('end', () => resolveHash(h.digest('hex')));
  });
}
