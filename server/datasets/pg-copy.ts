import "server-only";
import { once } from "node:events";
import type { Writable } from "node:stream";
import type postgres from "postgres";

/** PostgreSQL plumbing for uploads: a transaction opened mid-stream, and COPY FROM STDIN done safely. */

const ROLLBACK = Symbol("rollback");

export type OpenTransaction = {
  tx: postgres.TransactionSql;
  commit(): Promise<void>;
  rollback(): Promise<void>;
};

export function openTransaction(sql: postgres.Sql): Promise<OpenTransaction> {
  return new Promise((resolveOpen, rejectOpen) => {
    let opened = false;
    const done = sql.begin(
      (tx) =>
        new Promise<void>((resolveBody, rejectBody) => {
          opened = true;
          resolveOpen({
            tx,
            commit: async () => {
              resolveBody();
              await done;
            },
            rollback: async () => {
              rejectBody(ROLLBACK);
              await done.catch((error: unknown) => {
                if (error !== ROLLBACK) throw error;
              });
            },
          });
        }),
    ) as Promise<void>;
    done.catch((error: unknown) => {
      if (!opened) rejectOpen(error);
    });
  });
}

export async function writeCopy(stream: Writable, chunk: Buffer): Promise<void> {
  if (stream.destroyed || stream.errored) throw stream.errored ?? new Error("COPY stream closed");
  if (!stream.write(chunk)) await once(stream, "drain");
}

/**
 * Ends a COPY FROM STDIN and waits for the server's verdict. postgres.js 3.4.9 never settles the
 * writable when the server fails the COPY after CopyDone (porsager/postgres#1173), so a `select 1`
 * queued right behind the CopyDone settles instead: it fails when the COPY failed (the transaction is
 * aborted) and succeeds after it completed.
 */
export async function endCopy(tx: postgres.TransactionSql, stream: Writable, last: Buffer[]): Promise<void> {
  for (const chunk of last.slice(0, -1)) await writeCopy(stream, chunk);
  const tail = last[last.length - 1];
  // the last write with a callback: once it ran nothing is pending, so end() sends CopyDone at once
  if (tail) {
    await new Promise<void>((resolve, reject) => {
      stream.write(tail, (error) => (error ? reject(error) : resolve()));
    });
  }
  const finished = new Promise<void>((resolve, reject) => {
    stream.once("finish", resolve);
    stream.once("error", reject);
  });
  finished.catch(() => {});
  stream.end();
  try {
    await Promise.all([finished, tx`select 1`]);
  } catch (error) {
    if ((error as { code?: string }).code === "25P02") {
      throw new Error("COPY failed on the server; postgres.js does not pass the reason on (see the PostgreSQL log)", { cause: error });
    }
    throw error;
  }
}

export async function copyFrom(tx: postgres.TransactionSql, statement: string): Promise<Writable> {
  const stream = (await tx.unsafe(statement).writable()) as Writable;
  stream.on("error", () => {}); // errors surface through write()/endCopy()
  return stream;
}
