/**
 * Helpers for the report and review browser tests: an API session over plain fetch (cookie kept
 * by hand), a scripted exam drive through the HTTP API (tests/support/scripted-operator through a
 * fetch port), and waiting for the scoring job. No vitest imports, so a local script can use it.
 */
import type { AttemptReport, AttemptStart, Call } from '../../shared/schemas';
import type { BatchResult, Command, EstimatePin } from '../../shared/sim';
import { shippedContent } from '../support/content';
import { driveTrial, type DrivePort } from '../support/scripted-operator';

export class ApiSession {
  private cookie = '';

  constructor(readonly baseUrl: string) {}

  async request<T>(method: string, path: string, body?: unknown): Promise<{ status: number; body: T }> {
    const response = await fetch(new URL(path, this.baseUrl), {
      method,
      headers: { Accept: 'application/json', ...(body !== undefined ? { 'Content-Type': 'application/json' } : {}), ...(this.cookie ? { Cookie: this.cookie } : {}) },
      body: body !== undefined ? JSON.stringify(body) : undefined,
    });
    const cookies = response.headers.getSetCookie();
    if (cookies.length) this.cookie = cookies.map((c) => c.split(';')[0]).join('; ');
    const text = await response.text();
    return { status: response.status, body: (text ? JSON.parse(text) : undefined) as T };
  }

  /** Like request, but throws unless the answer is 2xx. */
  async ok<T>(method: string, path: string, body?: unknown): Promise<T> {
    const res = await this.request<T>(method, path, body);
    if (res.status < 200 || res.status >= 300) throw new Error(`${method} ${path} answered ${res.status}: ${JSON.stringify(res.body)}`);
    return res.body;
  }

  static async signIn(baseUrl: string, email: string, password: string): Promise<ApiSession> {
    const session = new ApiSession(baseUrl);
    await session.ok('POST', '/api/auth/sign-in', { email, password });
    return session;
  }
}

/** The drive port of the scripted operator, over HTTP. */
export function fetchPort(session: ApiSession, attemptId: string): DrivePort {
  return {
    step: (fromSeq: number, commands: Command[]) => session.ok<BatchResult>('POST', `/api/attempts/${attemptId}/steps`, { fromSeq, commands }),
    call: (callPointId: string, call: Call, estimate: EstimatePin | null) =>
      session.ok<BatchResult>('POST', `/api/attempts/${attemptId}/calls`, { callPointId, call, ...(estimate ? { estimate } : {}) }),
  };
}

/** Starts a drive, lets the scripted operator drive it to the dock with `policy` at each call, and submits it. */
export async function submittedDrive(session: ApiSession, trialId: string, mode: 'practice' | 'exam', policy: (markersInView: string[]) => Call): Promise<string> {
  const start = await session.ok<AttemptStart>('POST', '/api/attempts', { trialId, mode });
  const content = shippedContent();
  const trial = content.trials.get(trialId)!;
  await driveTrial(trial, content.robots.get(trial.robotId)!, fetchPort(session, start.attempt.id), start.state, {
    chooseCall: (_cp, state) => policy(state.markersInView),
    batch: 5,
  });
  await session.ok('POST', `/api/attempts/${start.attempt.id}/submit`);
  return start.attempt.id;
}

/** The report once the scoring job has run (it answers 409 `scoring` until then). */
export async function reportOf(session: ApiSession, attemptId: string, timeoutMs = 20_000): Promise<AttemptReport> {
  const end = Date.now() + timeoutMs;
  for (;;) {
    const res = await session.request<AttemptReport & { error?: { code: string } }>('GET', `/api/attempts/${attemptId}/report`);
    if (res.status === 200) return res.body;
    if (res.body?.error?.code !== 'scoring' || Date.now() > end) throw new Error(`The report of ${attemptId} answered ${res.status}: ${JSON.stringify(res.body)}`);
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
}

/**
 * Closes a page once its requests have settled. Sessions are rolling (every API answer renews the
 * cookie), so an answer still on its way when the page closes can bring the session cookie back
 * after the next test has cleared it.
 */
export async function closeSettled(page: { waitForLoadState(state: 'networkidle'): Promise<void>; close(): Promise<void> }): Promise<void> {
  await page.waitForLoadState('networkidle').catch(() => undefined);
  await page.close();
}
