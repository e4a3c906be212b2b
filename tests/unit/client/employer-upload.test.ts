// @vitest-environment happy-dom
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { ApiError, api, onUnauthenticated, upload } from '@/api';

/** A stand-in XMLHttpRequest: records the request, then answers as the test says. */
class FakeXhr {
  static last: FakeXhr | null = null;
  method = '';
  url = '';
  headers: Record<string, string> = {};
  body: unknown = null;
  withCredentials = false;
  status = 0;
  responseText = '';
  upload: { onprogress: ((e: { loaded: number; total: number; lengthComputable: boolean }) => void) | null } = { onprogress: null };
  onload: (() => void) | null = null;
  onerror: (() => void) | null = null;
  onabort: (() => void) | null = null;
  aborted = false;

  constructor() {
    FakeXhr.last = this;
  }
  open(method: string, url: string) {
    this.method = method;
    this.url = url;
  }
  setRequestHeader(name: string, value: string) {
    this.headers[name] = value;
  }
  send(body: unknown) {
    this.body = body;
  }
  abort() {
    this.aborted = true;
    this.onabort?.();
  }
  answer(status: number, body: unknown) {
    this.status = status;
    this.responseText = typeof body === 'string' ? body : JSON.stringify(body);
    this.onload?.();
  }
}

beforeEach(() => {
  FakeXhr.last = null;
  vi.stubGlobal('XMLHttpRequest', FakeXhr);
});

afterEach(() => {
  onUnauthenticated(null);
  vi.unstubAllGlobals();
});

describe('upload with progress', () => {
  it('posts the roster as the multipart field "roster" and reports progress', async () => {
    const seen: number[] = [];
    const append = vi.spyOn(FormData.prototype, 'append');
    const file = new Blob(['email,name\n'], { type: 'text/csv' });
    const done = api.organizations.previewRoster(7, file, { onProgress: (p) => seen.push(p.loaded / p.total) }, 'team.csv');
    const xhr = FakeXhr.last!;
    expect(xhr.method).toBe('POST');
    expect(xhr.url).toBe('/api/organizations/7/roster/preview');
    expect(xhr.withCredentials).toBe(true);
    expect(xhr.body).toBeInstanceOf(FormData);
    expect(append).toHaveBeenCalledWith('roster', file, 'team.csv');
    xhr.upload.onprogress!({ loaded: 5, total: 10, lengthComputable: true });
    xhr.upload.onprogress!({ loaded: 10, total: 10, lengthComputable: true });
    xhr.answer(200, { rows: [], errors: 0, toInvite: 0, toUpdate: 0, duplicates: 0 });
    await expect(done).resolves.toMatchObject({ errors: 0 });
    expect(seen).toEqual([0.5, 1]);
  });

  it('turns an error answer into an ApiError that keeps the server body (a refused import carries its preview)', async () => {
    const done = upload('/api/organizations/7/roster/import', new FormData());
    FakeXhr.last!.answer(400, {
      error: { code: 'roster_has_errors', message: '1 row has errors. Nothing was imported.', preview: { errors: 1 } },
    });
    const error = (await done.catch((e: unknown) => e)) as ApiError;
    expect(error).toBeInstanceOf(ApiError);
    expect(error.code).toBe('roster_has_errors');
    expect(error.message).toBe('1 row has errors. Nothing was imported.');
    expect((error.body as { preview?: unknown }).preview).toEqual({ errors: 1 });
  });

  it('explains answers without a JSON error, network failures and an ended session', async () => {
    const tooLarge = upload('/x', new FormData());
    FakeXhr.last!.answer(502, '<html>bad gateway</html>');
    await expect(tooLarge).rejects.toMatchObject({ status: 502, code: 'http_error' });

    const offline = upload('/x', new FormData());
    FakeXhr.last!.onerror!();
    await expect(offline).rejects.toMatchObject({ status: 0, code: 'network_error' });

    const ended = vi.fn();
    onUnauthenticated(ended);
    const signedOut = upload('/api/organizations/7/roster/preview', new FormData());
    FakeXhr.last!.answer(401, { error: { code: 'unauthenticated', message: 'Sign in.' } });
    await expect(signedOut).rejects.toMatchObject({ status: 401 });
    expect(ended).toHaveBeenCalledWith('/api/organizations/7/roster/preview');
  });

  it('stops when its signal is aborted', async () => {
    const controller = new AbortController();
    const done = upload('/x', new FormData(), { signal: controller.signal });
    controller.abort();
    await expect(done).rejects.toMatchObject({ name: 'AbortError' });
    expect(FakeXhr.last!.aborted).toBe(true);
  });
});
