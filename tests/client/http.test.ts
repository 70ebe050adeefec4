import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { ApiError, http, isApiError, onUnauthenticated, registerCsrfSource } from '@/api/http';
import { jsonResponse } from './support/fixtures';

const fetchMock = vi.fn<typeof fetch>();

function headersOf(call: number): Record<string, string> {
  const init = fetchMock.mock.calls[call]![1]!;
  return init.headers as Record<string, string>;
}

beforeEach(() => {
  fetchMock.mockReset();
  vi.stubGlobal('fetch', fetchMock);
  registerCsrfSource(null);
  onUnauthenticated(null);
});

afterEach(() => {
  vi.unstubAllGlobals();
});

describe('http wrapper', () => {
  it('sends JSON with same-origin credentials and no CSRF header on GET', async () => {
    registerCsrfSource({ token: () => 'tok-1', refresh: vi.fn() });
    fetchMock.mockResolvedValueOnce(jsonResponse(200, [{ id: 1 }]));

    const body = await http.get<{ id: number }[]>('/api/farms', { query: { includeArchived: 'true', skip: undefined } });

    expect(body).toEqual([{ id: 1 }]);
    const [url, init] = fetchMock.mock.calls[0]!;
    expect(url).toBe('/api/farms?includeArchived=true');
    expect(init!.credentials).toBe('same-origin');
    expect(headersOf(0)['X-CSRF-Token']).toBeUndefined();
    expect(headersOf(0).Accept).toBe('application/json');
  });

  it.each(['post', 'patch', 'put', 'delete'] as const)('adds the X-CSRF-Token header on %s', async (verb) => {
    registerCsrfSource({ token: () => 'tok-write', refresh: vi.fn() });
    fetchMock.mockResolvedValueOnce(jsonResponse(204));

    const result = await http[verb]('/api/farms/3');

    expect(result).toBeUndefined();
    expect(headersOf(0)['X-CSRF-Token']).toBe('tok-write');
    expect(fetchMock.mock.calls[0]![1]!.method).toBe(verb.toUpperCase());
  });

  it('serialises the body as JSON with a content type when a body is given', async () => {
    registerCsrfSource({ token: () => 't', refresh: vi.fn() });
    fetchMock.mockResolvedValueOnce(jsonResponse(201, { id: 9 }));

    await http.post('/api/farms', { name: 'Upper paddock' });

    expect(fetchMock.mock.calls[0]![1]!.body).toBe('{"name":"Upper paddock"}');
    expect(headersOf(0)['Content-Type']).toBe('application/json');
  });

  it('re-fetches the session and retries once with the new token when the server says csrf_invalid', async () => {
    let token = 'stale';
    const refresh = vi.fn(async () => {
      token = 'fresh';
    });
    registerCsrfSource({ token: () => token, refresh });
    fetchMock
      .mockResolvedValueOnce(jsonResponse(403, { error: { code: 'csrf_invalid', message: 'Invalid CSRF token' } }))
      .mockResolvedValueOnce(jsonResponse(200, { ok: true }));

    const body = await http.patch('/api/auth/me', { name: 'A' });

    expect(body).toEqual({ ok: true });
    expect(refresh).toHaveBeenCalledTimes(1);
    expect(headersOf(0)['X-CSRF-Token']).toBe('stale');
    expect(headersOf(1)['X-CSRF-Token']).toBe('fresh');
  });

  it('gives up after one retry when the token is still refused', async () => {
    const refresh = vi.fn(async () => undefined);
    registerCsrfSource({ token: () => 'bad', refresh });
    const refused = () => jsonResponse(403, { error: { code: 'csrf_invalid', message: 'Invalid CSRF token' } });
    fetchMock.mockResolvedValueOnce(refused()).mockResolvedValueOnce(refused()).mockResolvedValueOnce(refused());

    await expect(http.post('/api/farms', {})).rejects.toMatchObject({ status: 403, code: 'csrf_invalid' });
    expect(fetchMock).toHaveBeenCalledTimes(2);
    expect(refresh).toHaveBeenCalledTimes(1);
  });

  it('does not retry a 403 that is not about the CSRF token', async () => {
    const refresh = vi.fn(async () => undefined);
    registerCsrfSource({ token: () => 't', refresh });
    fetchMock.mockResolvedValueOnce(jsonResponse(403, { error: { code: 'forbidden', message: 'Owners only' } }));

    await expect(http.post('/api/invitations', {})).rejects.toMatchObject({ status: 403, code: 'forbidden', message: 'Owners only' });
    expect(refresh).not.toHaveBeenCalled();
    expect(fetchMock).toHaveBeenCalledTimes(1);
  });

  it('maps the error body to an ApiError with status, code, message and field', async () => {
    fetchMock.mockResolvedValueOnce(
      jsonResponse(409, { error: { code: 'email_taken', message: 'email: someone with this e-mail address already has an account', field: 'email' } }),
    );

    const error = await http.post('/api/invitations', {}).catch((e: unknown) => e);

    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ status: 409, code: 'email_taken', field: 'email' });
    expect(isApiError(error, { status: 409, code: 'email_taken' })).toBe(true);
    expect(isApiError(error, { code: 'other' })).toBe(false);
  });

  it('still throws a readable ApiError when the error body is not JSON', async () => {
    fetchMock.mockResolvedValueOnce(new Response('<html>Bad gateway</html>', { status: 502 }));

    await expect(http.get('/api/health')).rejects.toMatchObject({ status: 502, code: 'http_error', message: expect.stringMatching(/server/i) });
  });

  it('throws status 0 code network when fetch itself fails', async () => {
    fetchMock.mockRejectedValueOnce(new TypeError('Failed to fetch'));

    await expect(http.get('/api/auth/session')).rejects.toMatchObject({ status: 0, code: 'network' });
  });

  it('calls the unauthenticated handler on 401 unauthenticated but not on invalid_credentials', async () => {
    const handler = vi.fn();
    onUnauthenticated(handler);
    fetchMock
      .mockResolvedValueOnce(jsonResponse(401, { error: { code: 'invalid_credentials', message: 'E-mail or password is wrong' } }))
      .mockResolvedValueOnce(jsonResponse(401, { error: { code: 'unauthenticated', message: 'Sign in first' } }));

    await expect(http.post('/api/auth/sign-in', {})).rejects.toMatchObject({ code: 'invalid_credentials' });
    expect(handler).not.toHaveBeenCalled();
    await expect(http.get('/api/people')).rejects.toMatchObject({ code: 'unauthenticated' });
    expect(handler).toHaveBeenCalledWith('/api/people');
  });
});
