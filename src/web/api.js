// Thin client for the service's /v1 routes. Paths are relative so the page also works behind a path prefix.

/** An RFC 9457 problem answer (or a network failure), carrying the per-field errors when the service lists them. */
export class ApiProblem extends Error {
  constructor(status, title, detail, fieldErrors) {
    super(detail ? `${title}: ${detail}` : title);
    this.name = 'ApiProblem';
    this.status = status;
    this.title = title;
    this.detail = detail;
    this.fieldErrors = fieldErrors;
  }
}

/** Normalises the `errors` member of a problem document to [{ field, message }]. */
function fieldErrorsOf(problem) {
  const list = Array.isArray(problem?.errors) ? problem.errors : [];
  return list.map((entry) => ({
    field: String(entry.field ?? ''),
    message: [entry.message ?? '', entry.allowed ? `(allowed: ${entry.allowed})` : '']
      .filter(Boolean)
      .join(' '),
  }));
}

async function problemFrom(response) {
  let problem = null;
  try {
    problem = await response.json();
  } catch {
    // Not JSON: fall back to the status line.
  }
  const hint = response.status === 401 ? ' (enter the key under "Service access")' : '';
  return new ApiProblem(
    response.status,
    problem?.title ?? `HTTP ${response.status}`,
    `${problem?.detail ?? ''}${hint}`,
    fieldErrorsOf(problem),
  );
}

const keyStorage = 'kspace-planner.apiKey';

/** The API key, when the server requires one (API_KEYS set); kept for this browser tab only. */
export function apiKey() {
  return sessionStorage.getItem(keyStorage) ?? '';
}

export function setApiKey(key) {
  if (key) sessionStorage.setItem(keyStorage, key);
  else sessionStorage.removeItem(keyStorage);
}

function withKey(headers = {}) {
  const key = apiKey();
  return key ? { ...headers, 'x-api-key': key } : headers;
}

async function send(path, init) {
  let response;
  try {
    response = await fetch(path, { ...init, headers: withKey(init.headers) });
  } catch (error) {
    throw new ApiProblem(0, 'Service unreachable', String(error?.message ?? error), []);
  }
  if (!response.ok) throw await problemFrom(response);
  return response;
}

export async function getJson(path) {
  const response = await send(path, { headers: { accept: 'application/json' } });
  return response.json();
}

export async function postJson(path, body) {
  const response = await send(path, {
    method: 'POST',
    headers: { 'content-type': 'application/json', accept: 'application/json' },
    body: JSON.stringify(body),
  });
  return response.json();
}

/** POST a JSON body and take the answer as an image (e.g. the mask with Accept: image/png). */
export async function postForBlob(path, body, accept) {
  const response = await send(path, {
    method: 'POST',
    headers: { 'content-type': 'application/json', accept },
    body: JSON.stringify(body),
  });
  return response.blob();
}

export async function uploadImage(file) {
  const form = new FormData();
  form.append('file', file, file.name);
  const response = await send('v1/images', {
    method: 'POST',
    body: form,
    headers: { accept: 'application/json' },
  });
  return response.json();
}

/** GET any resource as a blob (images, CSV): a plain <img src> could not carry the API key. */
export async function getBlob(path, accept = '*/*') {
  const response = await send(path, { headers: { accept } });
  return response.blob();
}

export async function deleteResource(path) {
  await send(path, { method: 'DELETE', headers: { accept: 'application/json' } });
}

/** Turns an absolute service path from a response ("/v1/results/…") into one relative to the page. */
export function pageRelative(url) {
  if (typeof url !== 'string') return url;
  return url.startsWith('/') ? url.slice(1) : url;
}
