/**
 * A JSON body as tests read it: loosely, by property paths. The response shapes themselves are checked against the
 * contracts (lib/contracts) in tests/contracts.
 */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- the one loose type of the test suite, see above
export type LooseJson = Record<string, any>;

type Handler<P> = (request: Request, context: { params: Promise<P> }) => Promise<Response>;

export async function callRoute<P>(
  handler: Handler<P>,
  { method = "GET", path = "/api/test", body, params, formData }: { method?: string; path?: string; body?: unknown; params?: P; formData?: FormData },
) {
  const init: RequestInit = { method, headers: { host: "localhost:3000" } };
  if (formData) init.body = formData;
  else if (body !== undefined) {
    init.body = typeof body === "string" ? body : JSON.stringify(body);
    init.headers = { ...init.headers, "content-type": "application/json" };
  }
  const response = await handler(new Request(`http://localhost:3000${path}`, init), { params: Promise.resolve((params ?? {}) as P) });
  const text = await response.text();
  let json: unknown = null;
  try {
    json = text ? JSON.parse(text) : null;
  } catch {
    json = text;
  }
  return { status: response.status, json: json as LooseJson };
}
