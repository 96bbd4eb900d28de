// One door to the HTTP API: bearer key, problem+json errors as typed values, upload with progress.

export interface ProblemDetail {
  type: string;
  title: string;
  status: number;
  detail?: string;
  errors?: Array<{ path: string; message: string }>;
}

/** An RFC 9457 problem returned by the API (or made up here when the network fails). */
export class ApiProblem extends Error {
  readonly status: number;
  readonly type: string;
  readonly title: string;
  readonly detail: string | undefined;
  readonly errors: Array<{ path: string; message: string }>;

  constructor(problem: ProblemDetail) {
    super(problem.detail ? `${problem.title}: ${problem.detail}` : problem.title);
    this.name = 'ApiProblem';
    this.status = problem.status;
    this.type = problem.type;
    this.title = problem.title;
    this.detail = problem.detail;
    this.errors = problem.errors ?? [];
  }
}

export type Query = Record<string, string | number | boolean | null | undefined>;

export interface UploadProgress {
  loadedBytes: number;
  totalBytes: number;
}

export interface UploadHandle<T> {
  result: Promise<T>;
  abort: () => void;
}

export interface ApiClient {
  get<T>(path: string, query?: Query): Promise<T>;
  post<T>(path: string, body?: unknown, query?: Query): Promise<T>;
  patch<T>(path: string, body: unknown): Promise<T>;
  delete<T>(path: string, body?: unknown): Promise<T>;
  upload<T>(path: string, file: File, onProgress: (p: UploadProgress) => void, query?: Query): UploadHandle<T>;
}

export function withQuery(path: string, query?: Query): string {
  if (!query) return path;
  const params = new URLSearchParams();
  for (const [name, value] of Object.entries(query)) {
    if (value !== undefined && value !== null && value !== '') params.set(name, String(value));
  }
  const text = params.toString();
  return text ? `${path}?${text}` : path;
}

function problemFromBody(status: number, statusText: string, bodyText: string): ApiProblem {
  try {
    const body = JSON.parse(bodyText) as Partial<ProblemDetail>;
    if (body && typeof body === 'object' && (body.title || body.detail)) {
      return new ApiProblem({
        type: body.type ?? 'about:blank',
        title: body.title ?? statusText,
        status: body.status ?? status,
        detail: body.detail,
        errors: body.errors,
      });
    }
  } catch {
    // not JSON: fall through to a plain problem built from the status line
  }
  return new ApiProblem({ type: 'about:blank', title: statusText || `HTTP ${status}`, status, detail: bodyText.slice(0, 200) || undefined });
}

/**
 * @param baseUrl where `/api/v1` lives ('' for the same origin)
 * @param getKey reads the session's API key at call time
 * @param onUnauthorized called on 401 so the shell can ask for a key again
 */
export function createApiClient(baseUrl: string, getKey: () => string | null, onUnauthorized: () => void): ApiClient {
  const headers = (extra: Record<string, string> = {}): Record<string, string> => {
    const key = getKey();
    return { accept: 'application/json, application/problem+json', ...(key ? { authorization: `Bearer ${key}` } : {}), ...extra };
  };

  async function send<T>(method: string, path: string, body?: unknown, query?: Query): Promise<T> {
    let response: Response;
    try {
      response = await fetch(baseUrl + withQuery(path, query), {
        method,
        headers: headers(body === undefined ? {} : { 'content-type': 'application/json' }),
        body: body === undefined ? undefined : JSON.stringify(body),
      });
    } catch (err) {
      throw new ApiProblem({ type: 'about:blank', title: 'Service unreachable', status: 0, detail: (err as Error).message });
    }
    const text = await response.text();
    if (!response.ok) {
      if (response.status === 401) onUnauthorized();
      throw problemFromBody(response.status, response.statusText, text);
    }
    return (text ? JSON.parse(text) : null) as T;
  }

  return {
    get: (path, query) => send('GET', path, undefined, query),
    post: (path, body, query) => send('POST', path, body, query),
    patch: (path, body) => send('PATCH', path, body),
    delete: (path, body) => send('DELETE', path, body),
    upload<T>(path: string, file: File, onProgress: (p: UploadProgress) => void, query?: Query): UploadHandle<T> {
      // XMLHttpRequest, not fetch: only XHR reports upload progress in every browser.
      const xhr = new XMLHttpRequest();
      const result = new Promise<T>((resolve, reject) => {
        xhr.open('POST', baseUrl + withQuery(path, query));
        for (const [name, value] of Object.entries(headers())) xhr.setRequestHeader(name, value);
        xhr.upload.onprogress = (e) => onProgress({ loadedBytes: e.loaded, totalBytes: e.lengthComputable ? e.total : file.size });
        xhr.onload = () => {
          if (xhr.status >= 200 && xhr.status < 300) {
            try {
              resolve(JSON.parse(xhr.responseText) as T);
            } catch {
              reject(new ApiProblem({ type: 'about:blank', title: 'Unreadable response', status: xhr.status }));
            }
          } else {
            if (xhr.status === 401) onUnauthorized();
            reject(problemFromBody(xhr.status, xhr.statusText, xhr.responseText));
          }
        };
        xhr.onerror = () => reject(new ApiProblem({ type: 'about:blank', title: 'Upload failed', status: 0, detail: 'network error' }));
        xhr.onabort = () => reject(new ApiProblem({ type: 'about:blank', title: 'Upload cancelled', status: 0 }));
        const form = new FormData();
        form.append('file', file, file.name);
        xhr.send(form);
      });
      return { result, abort: () => xhr.abort() };
    },
  };
}
