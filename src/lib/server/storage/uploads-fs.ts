import { createHash, randomUUID } from 'node:crypto';
import { readFileSync } from 'node:fs';
import fs from 'node:fs/promises';
import path from 'node:path';
import { serverEnv } from '../env';

export interface StoredUpload {
  sha256: string;
  sizeBytes: number;
  /** Relative to the uploads folder: `<first two hex digits>/<sha256>`. */
  storedPath: string;
}

export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

export function storedPathFor(sha256: string): string {
  return path.posix.join(sha256.slice(0, 2), sha256);
}

function absolute(storedPath: string): string {
  return path.resolve(serverEnv().uploadsDir, storedPath);
}

/** Folders this process has made or found: at most 256, one per leading hex pair. */
const knownFolders = new Set<string>();

/**
 * Keeps the bytes as uploaded, named by their SHA-256 (never by the client's name). Written
 * to a temporary file and renamed, so a reader never sees half a file; the same bytes twice
 * land on the same name and the second write changes nothing.
 */
export async function storeUploadBytes(bytes: Uint8Array): Promise<StoredUpload> {
  const sha256 = sha256Hex(bytes);
  const storedPath = storedPathFor(sha256);
  const target = absolute(storedPath);
  try {
    const st = await fs.stat(target);
    if (st.size === bytes.byteLength) return { sha256, sizeBytes: bytes.byteLength, storedPath };
  } catch {
    /* not stored yet */
  }
  const folder = path.dirname(target);
  if (!knownFolders.has(folder)) {
    await fs.mkdir(folder, { recursive: true });
    knownFolders.add(folder);
  }
  const temp = `${target}.${randomUUID()}.part`;
  try {
    await fs.writeFile(temp, bytes);
  } catch (err) {
    // The folder went away under a running process: make it again, once.
    if ((err as NodeJS.ErrnoException).code !== 'ENOENT') throw err;
    await fs.mkdir(folder, { recursive: true });
    await fs.writeFile(temp, bytes);
  }
  await fs.rename(temp, target);
  return { sha256, sizeBytes: bytes.byteLength, storedPath };
}

/**
 * The stored bytes. Read synchronously on purpose: the fitting worker reads each file once,
 * files are small (see MAX_SWEEP_FILE_BYTES), and fs.promises.readFile costs about six times
 * the CPU of one blocking read on this kind of machine (four thread-pool hops per file).
 */
export async function readStoredUpload(storedPath: string): Promise<Buffer> {
  return readFileSync(absolute(storedPath));
}
