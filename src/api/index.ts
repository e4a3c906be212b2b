/**
 * The one typed module the client uses to talk to the Driftproof API (same origin, JSON,
 * cookie session). Every failure becomes an ApiError with the server's code and message.
 */
import type {
  ApiErrorBody,
  AttemptReport,
  AttemptStart,
  AttemptSummary,
  AuditEntry,
  AttemptView,
  BatchResult,
  CallAnswer,
  CapturedMail,
  CapturedMailSummary,
  EmployerSignup,
  FleetFileKind,
  FleetPracticeTrial,
  FleetProfileDetail,
  FleetProfileSummary,
  AlphaFitView,
  UmbmarkView,
  OperatorEnrol,
  OperatorProgress,
  Organization,
  OrganizationProfile,
  Page,
  PasswordResetConfirm,
  PasswordResetRequest,
  PublicLevel,
  PublicTrial,
  RobotSummary,
  BulkCheckRow,
  CredentialCheck,
  CredentialStatus,
  CredentialTrial,
  CredentialView,
  TrialSummary,
  PublicUser,
  ReviewInfo,
  ReviewQueueItem,
  ReviewQueueQuery,
  Role,
  RosterPreview,
  SeatOrderView,
  SeatPricing,
  SignIn,
  UserCreate,
  UserUpdate,
  USER_SORT_FIELDS,
  VerdictInput,
} from '@shared/schemas';

export type { BulkCheckRow, CredentialCheck, CredentialStatus, CredentialTrial, CredentialView, RobotSummary, TrialSummary };
import type { Command } from '@shared/sim';

/** Codes the client itself gives to failures that never reached a JSON answer. */
export const CLIENT_ERROR_CODES = {
  network: 'network_error',
  http: 'http_error',
  badResponse: 'bad_response',
} as const;

export class ApiError extends Error {
  override readonly name = 'ApiError';
  /** HTTP status; 0 when the server could not be reached at all. */
  readonly status: number;
  readonly code: string;
  /** Field path → message, for validation errors. */
  readonly fields: Record<string, string>;
  /** The server's whole error object (it may carry more, e.g. `expectedSeq`); null if there was none. */
  readonly body: ApiErrorBody['error'] | null;

  constructor(
    status: number,
    code: string,
    message: string,
    fields: Record<string, string> = {},
    body: ApiErrorBody['error'] | null = null,
  ) {
    super(message);
    this.status = status;
    this.code = code;
    this.fields = fields;
    this.body = body;
  }

  /** The message for one field, if the server sent one. */
  field(name: string): string | undefined {
    return this.fields[name];
  }
}

export function isApiError(value: unknown): value is ApiError {
  return value instanceof ApiError;
}

/** A message fit to show a person, whatever was thrown. */
export function errorMessage(error: unknown): string {
  if (isApiError(error)) return error.message;
  return 'Something went wrong. Try again in a moment.';
}

function isApiErrorBody(value: unknown): value is ApiErrorBody {
  if (typeof value !== 'object' || value === null) return false;
  const error = (value as { error?: unknown }).error;
  return (
    typeof error === 'object' &&
    error !== null &&
    typeof (error as { code?: unknown }).code === 'string' &&
    typeof (error as { message?: unknown }).message === 'string'
  );
}

type QueryValue = string | number | boolean | null | undefined;

export function buildQuery(query: Record<string, QueryValue> | undefined): string {
  if (!query) return '';
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value === undefined || value === null || value === '') continue;
    params.set(key, String(value));
  }
  const text = params.toString();
  return text ? `?${text}` : '';
}

export interface RequestOptions {
  body?: unknown;
  query?: Record<string, QueryValue>;
  signal?: AbortSignal;
}

let unauthenticatedHandler: ((path: string) => void) | null = null;

/**
 * Called when an API call (other than the session and sign-in calls themselves) answers 401:
 * the session ended, for example because it expired or the account was deactivated.
 */
export function onUnauthenticated(handler: ((path: string) => void) | null): void {
  unauthenticatedHandler = handler;
}

const SESSION_PATHS = ['/api/auth/me', '/api/auth/sign-in', '/api/auth/sign-out'];

export async function request<T>(method: string, path: string, options: RequestOptions = {}): Promise<T> {
  const headers: Record<string, string> = { Accept: 'application/json' };
  const init: RequestInit = { method, headers, credentials: 'same-origin', signal: options.signal };
  if (options.body !== undefined) {
    headers['Content-Type'] = 'application/json';
    init.body = JSON.stringify(options.body);
  }

  let response: Response;
  try {
    response = await fetch(path + buildQuery(options.query), init);
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause;
    throw new ApiError(
      0,
      CLIENT_ERROR_CODES.network,
      'Driftproof could not reach the server. Check your connection and try again.',
    );
  }

  if (response.status === 204 || response.status === 205) return undefined as T;

  const text = await response.text();
  let data: unknown = undefined;
  if (text) {
    try {
      data = JSON.parse(text);
    } catch {
      data = undefined;
    }
  }

  if (response.ok) {
    if (text && data === undefined) {
      throw new ApiError(
        response.status,
        CLIENT_ERROR_CODES.badResponse,
        'The server sent an answer Driftproof could not read. Try again in a moment.',
      );
    }
    return data as T;
  }

  let error: ApiError;
  if (isApiErrorBody(data)) {
    error = new ApiError(response.status, data.error.code, data.error.message, data.error.fields ?? {}, data.error);
  } else {
    error = new ApiError(
      response.status,
      CLIENT_ERROR_CODES.http,
      response.status >= 500
        ? `The server had a problem (HTTP ${response.status}). Try again in a moment.`
        : `The request failed (HTTP ${response.status}).`,
    );
  }
  if (response.status === 401 && !SESSION_PATHS.includes(path) && unauthenticatedHandler) {
    unauthenticatedHandler(path);
  }
  throw error;
}

/** How far an upload has got: bytes sent of the total (total 0 while the browser does not know). */
export interface UploadProgress {
  loaded: number;
  total: number;
}

export interface UploadOptions {
  onProgress?: (progress: UploadProgress) => void;
  signal?: AbortSignal;
}

/**
 * A multipart upload with progress (fetch cannot report upload progress; XMLHttpRequest can).
 * Answers and failures are read exactly as `request` reads them.
 */
export function upload<T>(path: string, form: FormData, options: UploadOptions = {}): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', path);
    xhr.withCredentials = true;
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.upload.onprogress = (event) => options.onProgress?.({ loaded: event.loaded, total: event.lengthComputable ? event.total : 0 });
    xhr.onerror = () =>
      reject(new ApiError(0, CLIENT_ERROR_CODES.network, 'Driftproof could not reach the server. Check your connection and try again.'));
    xhr.onabort = () => reject(new DOMException('The upload was cancelled.', 'AbortError'));
    xhr.onload = () => {
      const text = xhr.responseText;
      let data: unknown = undefined;
      if (text) {
        try {
          data = JSON.parse(text);
        } catch {
          data = undefined;
        }
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        if (text && data === undefined) {
          reject(new ApiError(xhr.status, CLIENT_ERROR_CODES.badResponse, 'The server sent an answer Driftproof could not read. Try again in a moment.'));
        } else {
          resolve(data as T);
        }
        return;
      }
      if (xhr.status === 401 && unauthenticatedHandler) unauthenticatedHandler(path);
      if (isApiErrorBody(data)) {
        reject(new ApiError(xhr.status, data.error.code, data.error.message, data.error.fields ?? {}, data.error));
      } else {
        reject(
          new ApiError(
            xhr.status,
            CLIENT_ERROR_CODES.http,
            xhr.status >= 500
              ? `The server had a problem (HTTP ${xhr.status}). Try again in a moment.`
              : `The request failed (HTTP ${xhr.status}).`,
          ),
        );
      }
    };
    if (options.signal) {
      if (options.signal.aborted) {
        reject(new DOMException('The upload was cancelled.', 'AbortError'));
        return;
      }
      options.signal.addEventListener('abort', () => xhr.abort(), { once: true });
    }
    xhr.send(form);
  });
}

// ---------------------------------------------------------------------------------------
// Endpoints

export type UserSortField = (typeof USER_SORT_FIELDS)[number];
export type SortOrder = 'asc' | 'desc';

export interface UserListParams {
  page?: number;
  pageSize?: number;
  sortField?: UserSortField;
  sortOrder?: SortOrder;
  q?: string;
  role?: Role;
  status?: 'active' | 'inactive';
}

export interface MailListParams {
  page?: number;
  pageSize?: number;
  q?: string;
}

export interface Health {
  status: 'ok' | 'degraded';
  database: 'up' | 'down';
}

export const authApi = {
  me: (signal?: AbortSignal) => request<{ user: PublicUser }>('GET', '/api/auth/me', { signal }),
  signIn: (body: SignIn) => request<{ user: PublicUser }>('POST', '/api/auth/sign-in', { body }),
  signOut: () => request<void>('POST', '/api/auth/sign-out'),
  requestPasswordReset: (body: PasswordResetRequest) =>
    request<{ message: string }>('POST', '/api/auth/password-reset', { body }),
  confirmPasswordReset: (body: PasswordResetConfirm) =>
    request<void>('POST', '/api/auth/password-reset/confirm', { body }),
};

export const healthApi = {
  get: () => request<Health>('GET', '/api/health'),
};

export const usersApi = {
  list: (params: UserListParams = {}, signal?: AbortSignal) =>
    request<Page<PublicUser>>('GET', '/api/users', { query: { ...params }, signal }),
  create: (body: UserCreate) => request<{ user: PublicUser }>('POST', '/api/users', { body }),
  update: (id: number, body: UserUpdate) =>
    request<{ user: PublicUser }>('PATCH', `/api/users/${encodeURIComponent(id)}`, { body }),
};

/** One row of an organization's seat ledger (as server/services/seats.ts `ledgerOf` returns it). */
export interface SeatLedgerRow {
  id: number;
  /** Seats added (positive) or taken (negative). */
  delta: number;
  kind: 'purchase' | 'grant' | 'exam_start' | 'void_return' | 'refund';
  orderId: string | null;
  attemptId: string | null;
  createdAt: string;
}

export interface SeatsOverview {
  balance: number;
  /** Newest first, at most 50. */
  ledger: SeatLedgerRow[];
  /** Newest first, at most 50. */
  orders: SeatOrderView[];
}

/** A change to the organization profile; `null` clears a field. */
export interface OrganizationChange {
  name?: string;
  billingEmail?: string | null;
  address?: string | null;
}

export interface OperatorListParams {
  page?: number;
  pageSize?: number;
  q?: string;
}

const orgPath = (orgId: number, tail = '') => `/api/organizations/${encodeURIComponent(orgId)}${tail}`;

/** The multipart body of a roster upload: the file in the field "roster". */
function rosterForm(file: Blob, fileName = 'roster.csv'): FormData {
  const form = new FormData();
  form.append('roster', file, fileName);
  return form;
}

export const organizationsApi = {
  list: () => request<{ items: Organization[] }>('GET', '/api/organizations'),
  get: (orgId: number, signal?: AbortSignal) =>
    request<{ organization: OrganizationProfile }>('GET', orgPath(orgId), { signal }),
  update: (orgId: number, body: OrganizationChange) =>
    request<{ organization: OrganizationProfile }>('PATCH', orgPath(orgId), { body }),
  /** Balance, ledger and orders in one answer. */
  seats: (orgId: number, signal?: AbortSignal) => request<SeatsOverview>('GET', orgPath(orgId, '/seats'), { signal }),
  /** A pending order and the address of the payment page to send the browser to. */
  createOrder: (orgId: number, quantity: number) =>
    request<{ order: SeatOrderView; checkoutUrl: string }>('POST', orgPath(orgId, '/orders'), { body: { quantity } }),
  /** One order of the organization. */
  order: (orgId: number, orderId: string, signal?: AbortSignal) =>
    request<{ order: SeatOrderView }>('GET', orgPath(orgId, `/orders/${encodeURIComponent(orderId)}`), { signal }),
  /** Gives up a pending checkout (the payment session is expired; nothing is charged). */
  cancelOrder: (orgId: number, orderId: string) =>
    request<{ order: SeatOrderView }>('POST', orgPath(orgId, `/orders/${encodeURIComponent(orderId)}/cancel`)),
  /** Admin only: seats without payment. Answers the new balance. */
  grantSeats: (orgId: number, count: number) =>
    request<{ balance: number }>('POST', orgPath(orgId, '/seat-grants'), { body: { count } }),
  operators: (orgId: number, params: OperatorListParams = {}, signal?: AbortSignal) =>
    request<Page<OperatorProgress>>('GET', orgPath(orgId, '/operators'), { query: { ...params }, signal }),
  /** A plain link (the browser downloads the file with the session cookie). */
  operatorsCsvUrl: (orgId: number) => orgPath(orgId, '/operators.csv'),
  enrol: (orgId: number, body: OperatorEnrol) =>
    request<{ id: number; invited: boolean }>('POST', orgPath(orgId, '/operators'), { body }),
  setLevels: (orgId: number, userId: number, levelIds: string[]) =>
    request<{ levelIds: string[] }>('PUT', orgPath(orgId, `/operators/${encodeURIComponent(userId)}/levels`), {
      body: { levelIds },
    }),
  resendInvitation: (orgId: number, userId: number) =>
    request<{ message: string }>('POST', orgPath(orgId, `/operators/${encodeURIComponent(userId)}/invitation`)),
  /** Reads the roster and answers each row with its status and errors; writes nothing. */
  previewRoster: (orgId: number, file: Blob, options: UploadOptions = {}, fileName?: string) =>
    upload<RosterPreview>(orgPath(orgId, '/roster/preview'), rosterForm(file, fileName), options),
  /** Imports the roster all or nothing (400 `roster_has_errors` carries the preview). */
  importRoster: (orgId: number, file: Blob, options: UploadOptions = {}, fileName?: string) =>
    upload<RosterPreview>(orgPath(orgId, '/roster/import'), rosterForm(file, fileName), options),
};

export const signupApi = {
  /** Creates the organization and its first employer account (not signed in yet). */
  signUp: (body: EmployerSignup) => request<{ user: PublicUser; message: string }>('POST', '/api/signup', { body }),
  confirmEmail: (token: string) => request<void>('POST', '/api/signup/confirm', { body: { token } }),
  resendConfirmation: () => request<{ message: string }>('POST', '/api/signup/resend-confirmation'),
};

/** A seat order as the admin lists it, with its organization. */
export type AdminSeatOrder = SeatOrderView & { organizationId: number; organizationName: string };

export const paymentsApi = {
  /** Public: the seat price and its volume tiers, in the smallest currency unit. */
  pricing: (signal?: AbortSignal) => request<{ pricing: SeatPricing }>('GET', '/api/pricing', { signal }),
  setPricing: (body: SeatPricing) => request<{ pricing: SeatPricing }>('PUT', '/api/pricing', { body }),
  /** Admin: the newest 200 orders, optionally of one organization. */
  orders: (params: { organizationId?: number } = {}, signal?: AbortSignal) =>
    request<{ items: AdminSeatOrder[] }>('GET', '/api/orders', { query: { ...params }, signal }),
  /** Admin: refunds unused seats of a paid order (409 `seats_in_use` when they are not there). */
  refund: (orderId: string, quantity: number) =>
    request<{ order: SeatOrderView }>('POST', `/api/orders/${encodeURIComponent(orderId)}/refunds`, { body: { quantity } }),
};

export const mailApi = {
  list: (params: MailListParams = {}, signal?: AbortSignal) =>
    request<Page<CapturedMailSummary>>('GET', '/api/mail-messages', { query: { ...params }, signal }),
  get: (id: number) => request<{ message: CapturedMail }>('GET', `/api/mail-messages/${encodeURIComponent(id)}`),
};

export const trialsApi = {
  levels: (signal?: AbortSignal) => request<{ items: PublicLevel[] }>('GET', '/api/levels', { signal }),
  list: (signal?: AbortSignal) => request<{ items: TrialSummary[] }>('GET', '/api/trials', { signal }),
  robots: (signal?: AbortSignal) => request<{ items: RobotSummary[] }>('GET', '/api/robots', { signal }),
  get: (id: string, signal?: AbortSignal) =>
    request<{ trial: PublicTrial }>('GET', `/api/trials/${encodeURIComponent(id)}`, { signal }),
};

export interface AttemptListParams {
  page?: number;
  pageSize?: number;
  sortOrder?: SortOrder;
  status?: AttemptSummary['status'];
  trialId?: string;
}

const attemptPath = (id: string, tail = '') => `/api/attempts/${encodeURIComponent(id)}${tail}`;

export const attemptsApi = {
  /** A practice drive may run on a fleet profile of the operator's organization (`fleetProfileId`). */
  start: (trialId: string, mode: AttemptSummary['mode'], fleetProfileId?: string) =>
    request<AttemptStart>('POST', '/api/attempts', { body: fleetProfileId ? { trialId, mode, fleetProfileId } : { trialId, mode } }),
  list: (params: AttemptListParams = {}, signal?: AbortSignal) =>
    request<Page<AttemptSummary>>('GET', '/api/attempts', { query: { ...params }, signal }),
  get: (id: string, signal?: AbortSignal) => request<AttemptView>('GET', attemptPath(id), { signal }),
  /** One numbered batch of commands; resending the same batch gets the stored answer. */
  steps: (id: string, fromSeq: number, commands: Command[], signal?: AbortSignal) =>
    request<BatchResult>('POST', attemptPath(id, '/steps'), { body: { fromSeq, commands }, signal }),
  /** The call at the call point the drive waits at; resending the same call gets the stored answer. */
  call: (id: string, answer: CallAnswer) => request<BatchResult>('POST', attemptPath(id, '/calls'), { body: answer }),
  submit: (id: string) => request<AttemptView>('POST', attemptPath(id, '/submit')),
  abandon: (id: string) => request<AttemptView>('POST', attemptPath(id, '/abandon')),
  examSeats: (signal?: AbortSignal) => request<{ available: number }>('GET', '/api/exam-seats', { signal }),
};

export const reportsApi = {
  /** The attempt report; 409 `scoring` while the scoring job runs, 409 `not_submitted` before submission. */
  get: (attemptId: string, signal?: AbortSignal) =>
    request<AttemptReport>('GET', attemptPath(attemptId, '/report'), { signal }),
};

/** The assessor's queue filters and order, as GET /api/reviews takes them (all optional). */
export type ReviewQueueParams = Partial<ReviewQueueQuery>;

const reviewPath = (attemptId: string, tail = '') => `/api/reviews/${encodeURIComponent(attemptId)}${tail}`;

export const reviewsApi = {
  queue: (params: ReviewQueueParams = {}, signal?: AbortSignal) =>
    request<Page<ReviewQueueItem>>('GET', '/api/reviews', { query: { ...params }, signal }),
  claim: (attemptId: string) => request<{ review: ReviewInfo }>('POST', reviewPath(attemptId, '/claim')),
  /** Signs a verdict on a claimed attempt (validate the body with verdictSchema first). */
  verdict: (attemptId: string, body: VerdictInput) =>
    request<{ review: ReviewInfo }>('POST', reviewPath(attemptId, '/verdict'), { body }),
  audit: (attemptId: string, signal?: AbortSignal) =>
    request<{ items: AuditEntry[] }>('GET', reviewPath(attemptId, '/audit'), { signal }),
};

// ---------------------------------------------------------------------------------------
// Fleet calibration (shapes in shared/schemas/fleet.ts)

/**
 * The robot fields of a calibration, as multipart text: a content robot's id and, optionally,
 * the employer's own wheel radius and wheelbase (metres) and encoder resolution; '' keeps the
 * content robot's value.
 */
export interface FleetRobotFormFields {
  robotId: string;
  wheelRadius: string;
  wheelbase: string;
  ticksPerRevolution: string;
}

function fleetForm(fields: Record<string, string>, files: { runs?: File | null; poses?: File | null }): FormData {
  const form = new FormData();
  for (const [key, value] of Object.entries(fields)) form.append(key, value);
  if (files.runs) form.append('runs', files.runs, files.runs.name);
  if (files.poses) form.append('poses', files.poses, files.poses.name);
  return form;
}

const fleetProfilePath = (orgId: number, profileId: string, tail = '') =>
  orgPath(orgId, `/fleet-profiles/${encodeURIComponent(profileId)}${tail}`);

export const fleetApi = {
  /** Reads UMBmark runs and answers the report; stores nothing. 400 `calibration_rows` lists the rows to fix. */
  previewUmbmark: (orgId: number, robot: FleetRobotFormFields, runs: File, options: UploadOptions = {}) =>
    upload<{ umbmark: UmbmarkView }>(orgPath(orgId, '/fleet-calibration/umbmark'), fleetForm({ ...robot }, { runs }), options),
  /** Fits a1..a4 to paired odometry and reference poses; stores nothing. 400 `calibration_rows` lists the rows to fix. */
  previewAlphaFit: (orgId: number, poses: File, options: UploadOptions = {}) =>
    upload<{ alphaFit: AlphaFitView }>(orgPath(orgId, '/fleet-calibration/alpha-fit'), fleetForm({}, { poses }), options),
  /** Saves a profile from the same files (either may be missing, not both). */
  create: (orgId: number, fields: FleetRobotFormFields & { name: string }, files: { runs?: File | null; poses?: File | null }, options: UploadOptions = {}) =>
    upload<{ profile: FleetProfileDetail }>(orgPath(orgId, '/fleet-profiles'), fleetForm({ ...fields }, files), options),
  list: (orgId: number, signal?: AbortSignal) =>
    request<{ items: FleetProfileSummary[] }>('GET', orgPath(orgId, '/fleet-profiles'), { signal }),
  get: (orgId: number, profileId: string, signal?: AbortSignal) =>
    request<{ profile: FleetProfileDetail }>('GET', fleetProfilePath(orgId, profileId), { signal }),
  /** A plain link to a stored source file (the browser downloads it with the session cookie). */
  fileUrl: (orgId: number, profileId: string, kind: FleetFileKind) =>
    fleetProfilePath(orgId, profileId, `/files/${encodeURIComponent(kind)}`),
  /** Replaces the practice trials that run on the profile. */
  setPracticeTrials: (orgId: number, profileId: string, trialIds: string[]) =>
    request<{ profile: FleetProfileDetail }>('PUT', fleetProfilePath(orgId, profileId, '/practice-trials'), { body: { trialIds } }),
  archive: (orgId: number, profileId: string) =>
    request<{ profile: FleetProfileDetail }>('POST', fleetProfilePath(orgId, profileId, '/archive')),
  /** Public: a sample file of each kind. */
  sampleUrl: (kind: FleetFileKind) => `/api/fleet-calibration/samples/${encodeURIComponent(kind)}`,
  /** Operator: the practice trials that run on their organization's fleet profiles. */
  practice: (signal?: AbortSignal) => request<{ items: FleetPracticeTrial[] }>('GET', '/api/fleet-practice', { signal }),
};

// ---------------------------------------------------------------------------------------
// Credentials and verification (their shapes are in shared/schemas/credentials.ts).

/**
 * A multipart POST; answers the raw response when it is a success. Failures become ApiErrors
 * exactly as in `request` (a 401 also tells the session handler).
 */
async function postForm(path: string, form: FormData, query?: Record<string, QueryValue>, accept = 'application/json'): Promise<Response> {
  let response: Response;
  try {
    response = await fetch(path + buildQuery(query), { method: 'POST', body: form, credentials: 'same-origin', headers: { Accept: accept } });
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause;
    throw new ApiError(0, CLIENT_ERROR_CODES.network, 'Driftproof could not reach the server. Check your connection and try again.');
  }
  if (response.ok) return response;
  let data: unknown = undefined;
  try {
    data = JSON.parse(await response.text());
  } catch {
    data = undefined;
  }
  if (response.status === 401 && unauthenticatedHandler) unauthenticatedHandler(path);
  if (isApiErrorBody(data)) throw new ApiError(response.status, data.error.code, data.error.message, data.error.fields ?? {}, data.error);
  throw new ApiError(
    response.status,
    CLIENT_ERROR_CODES.http,
    response.status >= 500 ? `The server had a problem (HTTP ${response.status}). Try again in a moment.` : `The request failed (HTTP ${response.status}).`,
  );
}

/** The multipart body of a bulk verification: the CSV in the field "numbers". */
function numbersForm(file: Blob, fileName: string): FormData {
  const form = new FormData();
  form.append('numbers', file, fileName);
  return form;
}

const credentialPath = (id: number, tail = '') => `/api/credentials/${encodeURIComponent(id)}${tail}`;

export const credentialsApi = {
  /** Operator: their own; employer and HR: their organization's; assessor and admin: all. Newest first. */
  list: (params: { expiringWithinDays?: number } = {}, signal?: AbortSignal) =>
    request<{ items: CredentialView[] }>('GET', '/api/credentials', { query: { ...params }, signal }),
  /** A plain link to the certificate PDF (holder, their employer, admin); the browser downloads it with the session cookie. */
  pdfUrl: (id: number) => credentialPath(id, '/pdf'),
  /** Admin and assessor; 409 `already_revoked`. */
  revoke: (id: number, reason: string) =>
    request<{ credential: CredentialView }>('POST', credentialPath(id, '/revoke'), { body: { reason } }),
};

export const verifyApi = {
  /** Public. `signature` is the `s` of a QR link. 404 `not_found` for any number not on record; 429 `rate_limited`. */
  check: (number: string, signature?: string, signal?: AbortSignal) =>
    request<{ credential: CredentialCheck }>('GET', `/api/verify/${encodeURIComponent(number)}`, { query: { s: signature }, signal }),
  /** HR, employer, admin: a CSV with a "number" column and an optional "name" column (≤ 1 MB, ≤ 1000 rows). */
  bulk: async (file: Blob, fileName = 'numbers.csv') =>
    (await postForm('/api/verify/bulk', numbersForm(file, fileName))).json() as Promise<{ items: BulkCheckRow[] }>,
  /** The same check answered as the server's CSV file. */
  bulkCsv: async (file: Blob, fileName = 'numbers.csv') =>
    (await postForm('/api/verify/bulk', numbersForm(file, fileName), { format: 'csv' }, 'text/csv')).blob(),
};

/** All endpoints, grouped by resource. */
export const api = {
  auth: authApi,
  health: healthApi,
  users: usersApi,
  organizations: organizationsApi,
  signup: signupApi,
  payments: paymentsApi,
  mail: mailApi,
  trials: trialsApi,
  attempts: attemptsApi,
  reports: reportsApi,
  reviews: reviewsApi,
  credentials: credentialsApi,
  verify: verifyApi,
  fleet: fleetApi,
};
