// @vitest-environment happy-dom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { ApiError, api, credentialsApi, onUnauthenticated, verifyApi } from '@/api';

const json = (status: number, body: unknown) => new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
const fetchMock = vi.fn<typeof fetch>();

beforeEach(() => {
  fetchMock.mockReset();
  vi.stubGlobal('fetch', fetchMock);
});

afterEach(() => {
  onUnauthenticated(null);
  vi.unstubAllGlobals();
});

describe('credential calls', () => {
  it('lists, with the expiring filter only when asked', async () => {
    fetchMock.mockImplementation(async () => json(200, { items: [] }));
    await credentialsApi.list();
    await api.credentials.list({ expiringWithinDays: 60 });
    expect(fetchMock.mock.calls.map(([url]) => url)).toEqual(['/api/credentials', '/api/credentials?expiringWithinDays=60']);
  });

  it('revokes with the reason as JSON, and keeps the already_revoked code', async () => {
    fetchMock.mockResolvedValueOnce(json(200, { credential: { id: 7, status: 'revoked' } }));
    fetchMock.mockResolvedValueOnce(json(409, { error: { code: 'already_revoked', message: 'This credential is already revoked.' } }));
    await credentialsApi.revoke(7, 'Exam conditions were not met.');
    const [url, init] = fetchMock.mock.calls[0];
    expect(url).toBe('/api/credentials/7/revoke');
    expect(init?.method).toBe('POST');
    expect(JSON.parse(String(init?.body))).toEqual({ reason: 'Exam conditions were not met.' });
    const again = (await credentialsApi.revoke(7, 'Exam conditions were not met.').catch((e: unknown) => e)) as ApiError;
    expect([again.status, again.code]).toEqual([409, 'already_revoked']);
  });

  it('links the certificate PDF', () => {
    expect(credentialsApi.pdfUrl(12)).toBe('/api/credentials/12/pdf');
  });
});

describe('verification calls', () => {
  it('checks a number with the signature of a QR link, encoded', async () => {
    fetchMock.mockImplementation(async () => json(200, { credential: { found: true } }));
    await verifyApi.check('DPC-7K2M-Q9XD-7', 'ab+/c=');
    await verifyApi.check('DPC-7K2M-Q9XD-7');
    expect(fetchMock.mock.calls.map(([url]) => url)).toEqual(['/api/verify/DPC-7K2M-Q9XD-7?s=ab%2B%2Fc%3D', '/api/verify/DPC-7K2M-Q9XD-7']);
  });

  it('reads "not found" and "rate limited" as ApiErrors with the server message', async () => {
    fetchMock.mockResolvedValueOnce(json(404, { error: { code: 'not_found', message: 'No credential has this number.' } }));
    fetchMock.mockResolvedValueOnce(json(429, { error: { code: 'rate_limited', message: 'Too many checks from your network. Wait a minute and try again.' } }));
    const missing = (await verifyApi.check('DPC-0000-0000-0').catch((e: unknown) => e)) as ApiError;
    const limited = (await verifyApi.check('DPC-0000-0000-0').catch((e: unknown) => e)) as ApiError;
    expect([missing.status, missing.code, missing.message]).toEqual([404, 'not_found', 'No credential has this number.']);
    expect([limited.status, limited.code]).toEqual([429, 'rate_limited']);
  });

  it('sends the CSV as the multipart field "numbers" and reads JSON or the CSV file', async () => {
    fetchMock.mockResolvedValueOnce(json(200, { items: [{ line: 2 }] }));
    fetchMock.mockResolvedValueOnce(new Response('line,number\r\n', { status: 200, headers: { 'Content-Type': 'text/csv' } }));
    const file = new Blob(['number\nDPC-0000-0000-0\n'], { type: 'text/csv' });

    expect(await verifyApi.bulk(file, 'staff.csv')).toEqual({ items: [{ line: 2 }] });
    const blob = await verifyApi.bulkCsv(file, 'staff.csv');
    expect(await blob.text()).toBe('line,number\r\n');

    const [[url1, init1], [url2, init2]] = fetchMock.mock.calls;
    expect([url1, url2]).toEqual(['/api/verify/bulk', '/api/verify/bulk?format=csv']);
    for (const init of [init1, init2]) {
      expect(init?.method).toBe('POST');
      expect(init?.credentials).toBe('same-origin');
      const form = init?.body as FormData;
      expect(form).toBeInstanceOf(FormData);
      expect(await (form.get('numbers') as Blob).text()).toBe('number\nDPC-0000-0000-0\n');
    }
  });

  it("turns a refused file into the server's message, and a 401 into the session handler", async () => {
    const handler = vi.fn();
    onUnauthenticated(handler);
    fetchMock.mockResolvedValueOnce(json(400, { error: { code: 'bad_columns', message: 'The file needs a header with a "number" column (and optionally "name").' } }));
    fetchMock.mockResolvedValueOnce(json(401, { error: { code: 'unauthenticated', message: 'Sign in first.' } }));
    fetchMock.mockResolvedValueOnce(new Response('<html>oops</html>', { status: 502 }));
    fetchMock.mockRejectedValueOnce(new TypeError('Failed to fetch'));
    const file = new Blob(['id\n1\n']);

    const bad = (await verifyApi.bulk(file).catch((e: unknown) => e)) as ApiError;
    expect([bad.status, bad.code]).toEqual([400, 'bad_columns']);
    await verifyApi.bulk(file).catch(() => undefined);
    expect(handler).toHaveBeenCalledWith('/api/verify/bulk');
    const gateway = (await verifyApi.bulkCsv(file).catch((e: unknown) => e)) as ApiError;
    expect([gateway.status, gateway.code]).toEqual([502, 'http_error']);
    const offline = (await verifyApi.bulk(file).catch((e: unknown) => e)) as ApiError;
    expect([offline.status, offline.code]).toEqual([0, 'network_error']);
  });
});
