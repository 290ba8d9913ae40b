/**
 * The one place all HTTP goes through: same-origin cookie session, the CSRF header on every
 * state-changing request, problem+json errors turned into ApiError.
 */
export type FieldIssue = { path: string; message: string };

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly title: string,
    readonly detail: string,
    readonly errors: FieldIssue[] = [],
    /** From Retry-After on 429, seconds. */
    readonly retryAfterS: number | null = null,
  ) {
    super(detail || title);
    this.name = 'ApiError';
  }

  /** Field messages keyed by the first path segment, for showing under form fields. */
  fieldErrors(): Record<string, string> {
    const out: Record<string, string> = {};
    for (const e of this.errors) {
      const key = e.path.split('.')[0] ?? '';
      if (key && !out[key]) out[key] = e.message;
    }
    return out;
  }
}

export const CSRF_HEADER = 'X-Ferrisight-Csrf';

type Method = 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
export type RequestOptions = {
  method?: Method;
  body?: unknown;
  signal?: AbortSignal;
  /** 'redirect' (default) sends the user to sign-in on 401; 'throw' lets the caller decide. */
  on401?: 'redirect' | 'throw';
};

let unauthorizedHandler: () => void = () => window.location.assign('/sign-in');

/** The app installs a router-aware handler (keeps the SPA, remembers where the user was). */
export function setUnauthorizedHandler(handler: () => void): void {
  unauthorizedHandler = handler;
}

async function toApiError(res: Response): Promise<ApiError> {
  const retryAfter = res.headers.get('Retry-After');
  const retryAfterS = retryAfter !== null && /^\d+$/.test(retryAfter) ? Number(retryAfter) : null;
  try {
    const p = (await res.json()) as { title?: string; detail?: string; errors?: FieldIssue[] };
    return new ApiError(res.status, p.title ?? res.statusText, p.detail ?? p.title ?? res.statusText, p.errors ?? [], retryAfterS);
  } catch {
    const detail = res.status >= 500 ? 'The Ferrisight server is not answering properly' : res.statusText;
    return new ApiError(res.status, res.statusText || 'Error', detail, [], retryAfterS);
  }
}

export async function apiRequest<T>(path: string, opts: RequestOptions = {}): Promise<T> {
  const method = opts.method ?? 'GET';
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (method !== 'GET') headers[CSRF_HEADER] = '1';
  if (opts.body !== undefined) headers['Content-Type'] = 'application/json';

  let res: Response;
  try {
    res = await fetch(path, {
      method,
      headers,
      credentials: 'same-origin',
      body: opts.body === undefined ? undefined : JSON.stringify(opts.body),
      signal: opts.signal,
    });
  } catch (err) {
    if ((err as Error).name === 'AbortError') throw err;
    throw new ApiError(0, 'network', 'Cannot reach the Ferrisight server. Check the network connection.');
  }

  if (res.status === 401 && (opts.on401 ?? 'redirect') === 'redirect') unauthorizedHandler();
  if (!res.ok) throw await toApiError(res);
  const text = await res.text();
  return (text ? JSON.parse(text) : undefined) as T;
}

export const api = {
  get: <T>(path: string, opts?: Omit<RequestOptions, 'method' | 'body'>) => apiRequest<T>(path, { ...opts, method: 'GET' }),
  post: <T>(path: string, body?: unknown, opts?: Omit<RequestOptions, 'method' | 'body'>) =>
    apiRequest<T>(path, { ...opts, method: 'POST', body }),
  patch: <T>(path: string, body: unknown, opts?: Omit<RequestOptions, 'method' | 'body'>) =>
    apiRequest<T>(path, { ...opts, method: 'PATCH', body }),
  put: <T>(path: string, body: unknown, opts?: Omit<RequestOptions, 'method' | 'body'>) =>
    apiRequest<T>(path, { ...opts, method: 'PUT', body }),
  delete: <T = void>(path: string, opts?: Omit<RequestOptions, 'method' | 'body'>) => apiRequest<T>(path, { ...opts, method: 'DELETE' }),
};

/**
 * Sends one file as multipart/form-data (field `file`). XMLHttpRequest rather than fetch,
 * because only it reports upload progress; errors come back as ApiError like every other call.
 * @param onProgress fraction 0…1 of the bytes sent
 */
export function apiUpload<T>(path: string, file: Blob, fileName: string, opts: { onProgress?: (fraction: number) => void; signal?: AbortSignal } = {}): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', path);
    xhr.withCredentials = true;
    xhr.setRequestHeader(CSRF_HEADER, '1');
    xhr.setRequestHeader('Accept', 'application/json');
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) opts.onProgress?.(e.loaded / e.total);
    };
    xhr.onerror = () => reject(new ApiError(0, 'network', 'Cannot reach the Ferrisight server. Check the network connection.'));
    xhr.onabort = () => reject(new DOMException('Upload cancelled', 'AbortError'));
    xhr.onload = () => {
      const res = new Response(xhr.responseText || null, { status: xhr.status, headers: { 'Content-Type': xhr.getResponseHeader('Content-Type') ?? '' } });
      if (xhr.status === 401) unauthorizedHandler();
      if (xhr.status < 200 || xhr.status >= 300) return void toApiError(res).then(reject);
      resolve((xhr.responseText ? JSON.parse(xhr.responseText) : undefined) as T);
    };
    opts.signal?.addEventListener('abort', () => xhr.abort());
    const form = new FormData();
    form.append('file', file, fileName);
    xhr.send(form);
  });
}

/** Builds a query string, leaving out undefined values. */
export function withQuery(path: string, params: Record<string, string | number | undefined>): string {
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) if (v !== undefined) q.set(k, String(v));
  const s = q.toString();
  return s ? `${path}?${s}` : path;
}
