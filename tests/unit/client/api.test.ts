// @vitest-environment happy-dom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { ApiError, api, buildQuery, errorMessage, onUnauthenticated, request } from '@/api';

function jsonResponse(status: number, body: unknown): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
}

const fetchMock = vi.fn<typeof fetch>();

beforeEach(() => {
  fetchMock.mockReset();
  vi.stubGlobal('fetch', fetchMock);
});

afterEach(() => {
  onUnauthenticated(null);
  vi.unstubAllGlobals();
});

describe('request', () => {
  it('sends JSON with the session cookie and returns the parsed body', async () => {
    fetchMock.mockResolvedValue(jsonResponse(200, { user: { id: 1, email: 'a@b.test' } }));

    const result = await api.auth.signIn({ email: 'a@b.test', password: 'secret-secret' });

    expect(result).toEqual({ user: { id: 1, email: 'a@b.test' } });
    const [url, init] = fetchMock.mock.calls[0];
    expect(url).toBe('/api/auth/sign-in');
    expect(init?.method).toBe('POST');
    expect(init?.credentials).toBe('same-origin');
    expect((init?.headers as Record<string, string>)['Content-Type']).toBe('application/json');
    expect(JSON.parse(String(init?.body))).toEqual({ email: 'a@b.test', password: 'secret-secret' });
  });

  it('returns undefined for 204 No Content', async () => {
    fetchMock.mockResolvedValue(new Response(null, { status: 204 }));
    await expect(api.auth.signOut()).resolves.toBeUndefined();
  });

  it('turns an ApiErrorBody into an ApiError with status, code, message and fields', async () => {
    fetchMock.mockResolvedValue(
      jsonResponse(400, {
        error: { code: 'validation_failed', message: 'Check the form.', fields: { email: 'Enter a valid e-mail address.' } },
      }),
    );

    const error = await api.auth.signIn({ email: 'x', password: 'y' }).catch((e: unknown) => e);

    expect(error).toBeInstanceOf(ApiError);
    const apiError = error as ApiError;
    expect(apiError.status).toBe(400);
    expect(apiError.code).toBe('validation_failed');
    expect(apiError.message).toBe('Check the form.');
    expect(apiError.fields).toEqual({ email: 'Enter a valid e-mail address.' });
    expect(apiError.field('email')).toBe('Enter a valid e-mail address.');
    expect(apiError.body?.code).toBe('validation_failed');
  });

  it("keeps the server's own message, e.g. for a wrong password or rate limiting", async () => {
    fetchMock.mockResolvedValueOnce(
      jsonResponse(401, { error: { code: 'invalid_credentials', message: 'That e-mail and password do not match an account.' } }),
    );
    fetchMock.mockResolvedValueOnce(jsonResponse(429, { error: { code: 'rate_limited', message: 'Too many attempts. Wait 15 minutes.' } }));

    const wrong = (await api.auth.signIn({ email: 'a@b.test', password: 'nope' }).catch((e: unknown) => e)) as ApiError;
    const limited = (await api.auth.signIn({ email: 'a@b.test', password: 'nope' }).catch((e: unknown) => e)) as ApiError;

    expect(wrong.code).toBe('invalid_credentials');
    expect(errorMessage(wrong)).toBe('That e-mail and password do not match an account.');
    expect(wrong.fields).toEqual({});
    expect(limited.status).toBe(429);
    expect(errorMessage(limited)).toBe('Too many attempts. Wait 15 minutes.');
  });

  it('gives a readable error when the server answers without a JSON error body', async () => {
    fetchMock.mockResolvedValue(new Response('<html>Bad Gateway</html>', { status: 502, headers: { 'Content-Type': 'text/html' } }));

    const error = (await request('GET', '/api/health').catch((e: unknown) => e)) as ApiError;

    expect(error).toBeInstanceOf(ApiError);
    expect(error.status).toBe(502);
    expect(error.code).toBe('http_error');
    expect(error.message).toMatch(/server had a problem/i);
  });

  it('gives a readable error when the network fails', async () => {
    fetchMock.mockRejectedValue(new TypeError('Failed to fetch'));

    const error = (await api.health.get().catch((e: unknown) => e)) as ApiError;

    expect(error).toBeInstanceOf(ApiError);
    expect(error.status).toBe(0);
    expect(error.code).toBe('network_error');
    expect(error.message).toMatch(/could not reach the server/i);
  });

  it('passes an abort through unchanged, so callers can ignore it', async () => {
    fetchMock.mockRejectedValue(new DOMException('The operation was aborted.', 'AbortError'));

    const error = await api.users.list({}, new AbortController().signal).catch((e: unknown) => e);

    expect(error).toBeInstanceOf(DOMException);
    expect((error as DOMException).name).toBe('AbortError');
  });

  it('refuses a success answer it cannot read', async () => {
    fetchMock.mockResolvedValue(new Response('not json', { status: 200 }));

    const error = (await api.organizations.list().catch((e: unknown) => e)) as ApiError;

    expect(error.code).toBe('bad_response');
  });

  it('reports a 401 from a data call as an ended session, but not from the session calls', async () => {
    const ended = vi.fn();
    onUnauthenticated(ended);
    fetchMock.mockImplementation(async () =>
      jsonResponse(401, { error: { code: 'unauthenticated', message: 'Sign in first.' } }),
    );

    await api.auth.me().catch(() => undefined);
    await api.auth.signIn({ email: 'a@b.test', password: 'x' }).catch(() => undefined);
    expect(ended).not.toHaveBeenCalled();

    const error = (await api.users.list().catch((e: unknown) => e)) as ApiError;
    expect(error.code).toBe('unauthenticated');
    expect(ended).toHaveBeenCalledWith('/api/users');
  });
});

describe('endpoint functions', () => {
  it('builds the users query from the set values only', async () => {
    fetchMock.mockResolvedValue(jsonResponse(200, { items: [], total: 0, page: 2, pageSize: 20 }));

    await api.users.list({ page: 2, pageSize: 20, sortField: 'lastSignInAt', sortOrder: 'desc', q: 'ann', role: undefined, status: 'inactive' });

    const url = new URL(String(fetchMock.mock.calls[0][0]), 'http://localhost');
    expect(url.pathname).toBe('/api/users');
    expect(Object.fromEntries(url.searchParams)).toEqual({
      page: '2',
      pageSize: '20',
      sortField: 'lastSignInAt',
      sortOrder: 'desc',
      q: 'ann',
      status: 'inactive',
    });
  });

  it('uses PATCH with the id in the path to change a user', async () => {
    fetchMock.mockResolvedValue(jsonResponse(200, { user: { id: 7 } }));

    await api.users.update(7, { active: false });

    const [url, init] = fetchMock.mock.calls[0];
    expect(url).toBe('/api/users/7');
    expect(init?.method).toBe('PATCH');
    expect(JSON.parse(String(init?.body))).toEqual({ active: false });
  });

  it('maps email_taken to an ApiError the form can show on the e-mail field', async () => {
    fetchMock.mockResolvedValue(jsonResponse(409, { error: { code: 'email_taken', message: 'An account with that e-mail already exists.' } }));

    const error = (await api.users
      .create({ email: 'taken@demo.test', name: 'Someone', role: 'assessor' })
      .catch((e: unknown) => e)) as ApiError;

    expect(error.status).toBe(409);
    expect(error.code).toBe('email_taken');
  });

  it('buildQuery skips empty values', () => {
    expect(buildQuery({ a: 1, b: '', c: undefined, d: null, e: false })).toBe('?a=1&e=false');
    expect(buildQuery({})).toBe('');
    expect(buildQuery(undefined)).toBe('');
  });
});
