// Uploaded logger files on disk: the record multer leaves, the generated name each is stored under,
// the label shown for it, its content hash, and deleting the ones no import refers to.
import { createHash, randomUUID } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { rm } from 'node:fs/promises';

/** A file multer stored: where it is, the generated name, and the label the browser gave it. */
export interface UploadedFile {
  path: string;
  storedName: string;
  originalName: string;
  sizeBytes: number;
}

/** A generated stored name (the upload's own name is never part of a path). */
export const storedNameFor = () => `${randomUUID()}.csv`;

/** A name from the browser made safe to show: no control characters, at most 255 characters. */
export function labelOf(originalName: string): string {
  const clean = originalName.replace(/[\u0000-\u001f\u007f]/g, '').trim();
  return (clean || 'upload.csv').slice(0, 255);
}

/** Deletes uploaded files that no import refers to. */
export async function discardUploads(files: UploadedFile[]): Promise<void> {
  await Promise.all(files.map((f) => rm(f.path, { force: true })));
}

/** The SHA-256 of a stored file's bytes, hex. */
export async function sha256Of(path: string): Promise<string> {
  const hash = createHash('sha256');
  for await (const chunk of createReadStream(path)) hash.update(chunk as Buffer);
  return hash.digest('hex');
}
