import { afterEach, describe, expect, it, vi } from 'vitest';
import { ApiError, NETWORK_ERROR_MESSAGE, buildUrl, request } from '@/api/http';
import { versionConflict } from '@/api/sheets';

function answer(status: number, body?: unknown): Response {
  return new Response(body === undefined ? null : JSON.stringify(body), {
    status,
    headers: { 'Content-Type': 'application/json' },
  });
}

afterEach(() => {
  vi.unstubAllGlobals();
});

describe('fetch wrapper', () => {
  it('sends JSON with the session cookie and returns the parsed answer', async () => {
    const fetchMock = vi.fn(async () => answer(201, { id: 'pq9', title: 'Snowpack melt', version: 1 }));
    vi.stubGlobal('fetch', fetchMock);
    const result = await request('/api/sheets', { method: 'POST', body: { title: 'Snowpack melt' } });
    expect(result).toEqual({ id: 'pq9', title: 'Snowpack melt', version: 1 });
    const [url, init] = fetchMock.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toBe('/api/sheets');
    expect(init.credentials).toBe('same-origin');
    expect(init.body).toBe('{"title":"Snowpack melt"}');
    expect((init.headers as Record<string, string>)['Content-Type']).toBe('application/json');
  });

  it('returns undefined for 204 No Content', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => answer(204)),
    );
    await expect(request('/api/sheets/pq9', { method: 'DELETE' })).resolves.toBeUndefined();
  });

  it('turns an error body into an ApiError with code, message, path and the other fields', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () =>
        answer(409, {
          error: {
            code: 'sheets.version_conflict',
            message: 'Version 5 was saved first.',
            currentVersion: 5,
          },
        }),
      ),
    );
    const error = await request('/api/sheets/pq9/versions', { method: 'POST', body: {} }).catch(
      (cause: unknown) => cause,
    );
    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({
      status: 409,
      code: 'sheets.version_conflict',
      message: 'Version 5 was saved first.',
    });
    expect(versionConflict(error)).toBe(5);
  });

  it('keeps the path of a validation error', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () =>
        answer(400, {
          error: {
            code: 'request.invalid',
            message: 'must be a finite number',
            path: ['document', 'cells', 2, 't1'],
          },
        }),
      ),
    );
    const error = (await request('/api/sheets', { method: 'POST', body: {} }).catch(
      (cause: unknown) => cause,
    )) as ApiError;
    expect(error.path).toEqual(['document', 'cells', 2, 't1']);
    expect(versionConflict(error)).toBeNull();
  });

  it('gives a readable message when the answer is not JSON', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => new Response('<html>Bad gateway</html>', { status: 502 })),
    );
    const error = (await request('/api/sheets').catch((cause: unknown) => cause)) as ApiError;
    expect(error.code).toBe('http.502');
    expect(error.message).toContain('502');
  });

  it('reports an unreachable server with a clear message and status 0', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => {
        throw new TypeError('Failed to fetch');
      }),
    );
    const error = (await request('/api/health').catch((cause: unknown) => cause)) as ApiError;
    expect(error).toBeInstanceOf(ApiError);
    expect(error.status).toBe(0);
    expect(error.message).toBe(NETWORK_ERROR_MESSAGE);
  });

  it('leaves empty query values out of the URL and encodes the rest', () => {
    expect(buildUrl('/api/admin/users', { search: 'ana & co', page: 2, pageSize: undefined })).toBe(
      '/api/admin/users?search=ana+%26+co&page=2',
    );
    expect(buildUrl('/api/admin/users', { search: '' })).toBe('/api/admin/users');
  });
});
