// One way to talk to the server: JSON in and out, the CSRF token on every
// write, and refusals turned into an ApiError a person can read.

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = "ApiError";
  }

  /** Field messages from a 400's zod issues, keyed by the dotted path. */
  fieldErrors(): Record<string, string> {
    const out: Record<string, string> = {};
    if (this.status === 400 && Array.isArray(this.details)) {
      for (const issue of this.details as { path?: (string | number)[]; message?: string }[]) {
        const key = (issue.path ?? []).join(".");
        if (key && !out[key]) out[key] = issue.message ?? "Not valid";
      }
    }
    return out;
  }
}

let csrfToken: string | null = null;

/** Remembers the token the sign-in answer carries (the session was regenerated). */
export function setCsrfToken(token: string | null) {
  csrfToken = token;
}

async function ensureCsrf(): Promise<string> {
  if (!csrfToken) {
    const res = await fetch("/api/auth/csrf", { credentials: "same-origin" });
    csrfToken = ((await res.json()) as { token: string }).token;
  }
  return csrfToken;
}

const FRIENDLY: Record<number, string> = {
  401: "Your session has ended; sign in again.",
  403: "Your role may not do this.",
  404: "Not found.",
  500: "Something went wrong on the server. Try again; if it keeps happening, tell your administrator.",
};

async function toError(res: Response): Promise<ApiError> {
  try {
    const body = (await res.json()) as { error?: { code: string; message: string; details?: unknown } };
    if (body.error) return new ApiError(res.status, body.error.code, body.error.message, body.error.details);
  } catch {
    /* not JSON */
  }
  return new ApiError(res.status, `http_${res.status}`, FRIENDLY[res.status] ?? `The server answered ${res.status}.`);
}

type Method = "GET" | "POST" | "PUT" | "PATCH" | "DELETE";

/** The answer of a request that succeeded; a refusal is thrown as an ApiError. */
async function send(method: Method, url: string, body?: unknown, retried = false): Promise<Response> {
  const headers: Record<string, string> = { Accept: "application/json" };
  let payload: BodyInit | undefined;
  if (body instanceof FormData) payload = body;
  else if (body !== undefined) {
    headers["Content-Type"] = "application/json";
    payload = JSON.stringify(body);
  }
  if (method !== "GET") headers["X-CSRF-Token"] = await ensureCsrf();
  const res = await fetch(url, { method, headers, body: payload, credentials: "same-origin" });
  if (!res.ok) {
    const err = await toError(res);
    // A stale token (e.g. after the server restarted) is fetched again once.
    if (err.code === "csrf_token_invalid" && !retried) {
      csrfToken = null;
      return send(method, url, body, true);
    }
    throw err;
  }
  return res;
}

async function request<T>(method: Method, url: string, body?: unknown): Promise<T> {
  const res = await send(method, url, body);
  if (res.status === 204) return undefined as T;
  return (await res.json()) as T;
}

/** A list answered as a bare array with its full count in X-Total-Count, as the page { items, total }. */
async function getWithTotal<T>(url: string): Promise<{ items: T[]; total: number }> {
  const res = await send("GET", url);
  const items = (await res.json()) as T[];
  return { items, total: Number(res.headers.get("X-Total-Count") ?? items.length) };
}

export const api = {
  get: <T>(url: string) => request<T>("GET", url),
  getWithTotal,
  post: <T>(url: string, body?: unknown) => request<T>("POST", url, body ?? {}),
  put: <T>(url: string, body?: unknown) => request<T>("PUT", url, body ?? {}),
  patch: <T>(url: string, body?: unknown) => request<T>("PATCH", url, body ?? {}),
  delete: <T>(url: string) => request<T>("DELETE", url),
  upload: <T>(url: string, form: FormData) => request<T>("POST", url, form),
};

/** Builds a query string from defined values only. */
export function qs(params: Record<string, string | number | boolean | null | undefined | (string | number)[]>): string {
  const sp = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) {
    if (v === undefined || v === null || v === "") continue;
    if (Array.isArray(v)) v.forEach((x) => sp.append(k, String(x)));
    else sp.set(k, String(v));
  }
  const s = sp.toString();
  return s ? `?${s}` : "";
}

/** A readable sentence for any error thrown by a query or mutation. */
export function errorMessage(e: unknown): string {
  if (e instanceof ApiError) return e.message;
  if (e instanceof Error) return e.message;
  return "Something went wrong.";
}
