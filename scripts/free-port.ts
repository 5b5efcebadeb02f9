// A free TCP port for servers a benchmark or a test starts of its own, never one of the ports `npm start` and `npm test`
// (with any TEST_PORT_OFFSET up to 99) use: the web 3000-3199, SMTP 2525-2699, PostgreSQL 54329-54499.
import { once } from "node:events";
import { createServer, type AddressInfo } from "node:net";

const RESERVED: ReadonlyArray<readonly [number, number]> = [
  [2525, 2699],
  [3000, 3199],
  [54329, 54499],
];

export const isReservedPort = (port: number) => RESERVED.some(([from, to]) => port >= from && port <= to);

/** `preferred` when given, else a port the system hands out that is free now and not reserved above. */
export async function freePort(preferred?: string): Promise<string> {
  if (preferred) return preferred;
  for (let attempt = 0; attempt < 50; attempt++) {
    const server = createServer();
    server.listen(0, "127.0.0.1");
    await once(server, "listening");
    const { port } = server.address() as AddressInfo;
    server.close();
    await once(server, "close");
    if (!isReservedPort(port)) return String(port);
  }
  throw new Error("no free port outside the reserved ranges");
}
