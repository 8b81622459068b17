/** What lab components read back from Proofbay's JSON error shape. */
export type ApiErrorBody = { code?: string; message?: string; fields?: Record<string, string> };

export class LabApiError extends Error {
  constructor(
    readonly status: number,
    readonly body: ApiErrorBody,
  ) {
    super(body.message ?? `The lab API answered HTTP ${status}.`);
  }
}

function readError(payload: unknown): ApiErrorBody {
  if (typeof payload === "object" && payload !== null && "error" in payload) {
    const error = (payload as { error: unknown }).error;
    if (typeof error === "object" && error !== null) return error as ApiErrorBody;
  }
  return {};
}

/** fetch + JSON, throwing LabApiError with the server's message on a non-2xx answer. */
export async function labFetch<T>(url: string, init: RequestInit = {}): Promise<T> {
  const response = await fetch(url, { ...init, headers: { accept: "application/json", ...(init.body ? { "content-type": "application/json" } : {}), ...init.headers } });
  const payload: unknown = await response.json().catch(() => null);
  if (!response.ok) throw new LabApiError(response.status, readError(payload));
  return payload as T;
}
