import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { importMappingSchema } from '@shared/imports';
import { ApiError, onUnauthenticated, registerCsrfSource } from '@/api/http';
import { fetchImportSetup, uploadLoggerFiles } from '@/api/imports';
import { jsonResponse } from './support/fixtures';

/** A stand-in XMLHttpRequest that records what is sent and answers with the next scripted reply. */
class FakeXhr {
  static sent: FakeXhr[] = [];
  static replies: { status: number; body?: unknown }[] = [];
  method = '';
  url = '';
  headers: Record<string, string> = {};
  body: FormData | null = null;
  status = 0;
  responseText = '';
  upload: { onprogress: ((e: { lengthComputable: boolean; loaded: number; total: number }) => void) | null; onload: (() => void) | null } = { onprogress: null, onload: null };
  onload: (() => void) | null = null;
  onerror: (() => void) | null = null;
  onabort: (() => void) | null = null;

  open(method: string, url: string) {
    this.method = method;
    this.url = url;
  }
  setRequestHeader(name: string, value: string) {
    this.headers[name] = value;
  }
  abort() {
    this.onabort?.();
  }
  send(body: FormData) {
    this.body = body;
    FakeXhr.sent.push(this);
    const reply = FakeXhr.replies.shift();
    queueMicrotask(() => {
      if (!reply) return this.onerror?.();
      this.upload.onprogress?.({ lengthComputable: true, loaded: 60, total: 120 });
      this.upload.onprogress?.({ lengthComputable: true, loaded: 120, total: 120 });
      this.upload.onload?.();
      this.status = reply.status;
      this.responseText = reply.body === undefined ? '' : JSON.stringify(reply.body);
      this.onload?.();
    });
  }
}

const mapping = importMappingSchema.parse({ timestamp: { column: 'Time', format: 'iso8601' }, value: { column: 'Level (mm)', kind: 'level', unit: 'mm' } });
const file = new File(['Time,Level (mm)\n2026-11-01T06:00:00Z,612\n'], 'creek.csv', { type: 'text/csv' });

beforeEach(() => {
  FakeXhr.sent = [];
  FakeXhr.replies = [];
  vi.stubGlobal('XMLHttpRequest', FakeXhr);
  registerCsrfSource(null);
  onUnauthenticated(null);
});

afterEach(() => {
  vi.unstubAllGlobals();
});

describe('uploadLoggerFiles', () => {
  it('posts the files and the text fields the server reads, with the CSRF token, and reports upload progress', async () => {
    registerCsrfSource({ token: () => 'tok-upload', refresh: vi.fn() });
    FakeXhr.replies.push({ status: 201, body: { imports: [{ id: 9 }] } });
    const progress: [number, number][] = [];
    const onSent = vi.fn();

    const out = await uploadLoggerFiles({ tankId: 21, policy: 'valid-rows', mapping, files: [file] }, { onProgress: (s, t) => progress.push([s, t]), onSent });

    expect(out).toEqual([{ id: 9 }]);
    const [xhr] = FakeXhr.sent;
    expect([xhr.method, xhr.url]).toEqual(['POST', '/api/imports']);
    expect(xhr.headers['X-CSRF-Token']).toBe('tok-upload');
    expect(xhr.headers['Content-Type']).toBeUndefined();
    expect(xhr.body!.get('tankId')).toBe('21');
    expect(xhr.body!.get('policy')).toBe('valid-rows');
    expect(importMappingSchema.parse(JSON.parse(xhr.body!.get('mapping') as string))).toEqual(mapping);
    expect((xhr.body!.getAll('files') as File[]).map((f) => f.name)).toEqual(['creek.csv']);
    expect(progress).toEqual([
      [60, 120],
      [120, 120],
    ]);
    expect(onSent).toHaveBeenCalled();
  });

  it('fetches a fresh CSRF token and sends once more when the server says csrf_invalid', async () => {
    let token = 'stale';
    const refresh = vi.fn(async () => {
      token = 'fresh';
    });
    registerCsrfSource({ token: () => token, refresh });
    FakeXhr.replies.push({ status: 403, body: { error: { code: 'csrf_invalid', message: 'The form has expired' } } }, { status: 201, body: { imports: [] } });

    await uploadLoggerFiles({ tankId: 21, policy: 'reject-file', mapping, files: [file] });

    expect(refresh).toHaveBeenCalledTimes(1);
    expect(FakeXhr.sent.map((x) => x.headers['X-CSRF-Token'])).toEqual(['stale', 'fresh']);
  });

  it('throws the server error with its code and field', async () => {
    FakeXhr.replies.push({ status: 413, body: { error: { code: 'file_too_large', message: 'files: a file is larger than the upload limit', field: 'files' } } });

    const error = await uploadLoggerFiles({ tankId: 21, policy: 'reject-file', mapping, files: [file] }).catch((e: unknown) => e);

    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ status: 413, code: 'file_too_large', field: 'files' });
  });

  it('reports a cut connection as a network error and tells the app when the session is gone', async () => {
    const gone = vi.fn();
    onUnauthenticated(gone);
    FakeXhr.replies.push({ status: 401, body: { error: { code: 'unauthenticated', message: 'Please sign in' } } });

    await expect(uploadLoggerFiles({ tankId: 21, policy: 'reject-file', mapping, files: [file] })).rejects.toMatchObject({ status: 401 });
    expect(gone).toHaveBeenCalledWith('/api/imports');

    await expect(uploadLoggerFiles({ tankId: 21, policy: 'reject-file', mapping, files: [file] })).rejects.toMatchObject({ status: 0, code: 'network' });
  });
});

describe('fetchImportSetup', () => {
  afterEach(() => vi.unstubAllGlobals());

  it('reads a tank without a saved mapping from a 200 answer (no 404 in the console), and passes errors on', async () => {
    const fetchMock = vi.fn<typeof fetch>();
    vi.stubGlobal('fetch', fetchMock);
    const editors = [{ name: 'Nora Quill', role: 'manager' }];
    fetchMock.mockResolvedValueOnce(jsonResponse(200, { saved: null, tankEditors: editors }));
    fetchMock.mockResolvedValueOnce(jsonResponse(404, { error: { code: 'not_found', message: 'Tank not found' } }));

    await expect(fetchImportSetup(21)).resolves.toEqual({ saved: null, tankEditors: editors });
    await expect(fetchImportSetup(22)).rejects.toMatchObject({ code: 'not_found' });
    expect(fetchMock.mock.calls[0]![0]).toBe('/api/tanks/21/import-mapping');
  });
});
