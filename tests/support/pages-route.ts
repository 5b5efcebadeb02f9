// Calls a Pages Router API route (server/http/pages-route.ts) the way Next does: a real Node HTTP
// server on 127.0.0.1 hands it Node's request (with `query` holding the path parameters) and response.
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import type { AddressInfo } from "node:net";

type PagesHandler = (request: IncomingMessage & { query?: Record<string, string | string[] | undefined> }, response: ServerResponse) => Promise<void>;

/**
 * Sends `request` (its path, method, headers and body) to `handler` over HTTP and returns the answer.
 * `chunked`: send the body as a stream of undeclared length instead of with a Content-Length.
 */
export async function callPagesRoute(
  handler: PagesHandler,
  request: Request,
  pathParams: Record<string, string> = {},
  { chunked = false }: { chunked?: boolean } = {},
): Promise<Response> {
  const server = createServer((incoming, outgoing) => {
    const search = new URL(incoming.url ?? "/", "http://127.0.0.1").searchParams;
    const query: Record<string, string | string[]> = Object.fromEntries(search.entries());
    void handler(Object.assign(incoming, { query: { ...query, ...pathParams } }), outgoing);
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  try {
    const { port } = server.address() as AddressInfo;
    const url = new URL(request.url);
    const bytes = request.body ? new Uint8Array(await request.arrayBuffer()) : undefined;
    const body = bytes && chunked ? new Blob([bytes]).stream() : bytes;
    const response = await fetch(`http://127.0.0.1:${port}${url.pathname}${url.search}`, {
      method: request.method,
      headers: request.headers,
      body,
      duplex: "half",
    } as RequestInit);
    // Read the body before the server closes.
    const answer = await response.arrayBuffer();
    return new Response(response.status === 204 ? null : answer, { status: response.status, headers: response.headers });
  } finally {
    server.closeAllConnections();
    await new Promise<void>((resolve) => server.close(() => resolve()));
  }
}
