// Data handed to MariaDB's LOAD DATA LOCAL INFILE from memory. The connection option
// `infileStreamFactory` (server/db.ts) answers the server's request for a "file" only with a stream
// offered here under a generated name, once; any other name, a path on disk included, is refused.
import { randomUUID } from 'node:crypto';
import { Readable } from 'node:stream';

const offered = new Map<string, Buffer>();
const PREFIX = 'brimstock-memory/';

/** Offers `data` to the next LOAD DATA LOCAL INFILE naming the returned name (the name goes in the SQL). */
export function offerLocalInfile(data: Buffer): string {
  const name = `${PREFIX}${randomUUID()}`;
  offered.set(name, data);
  return name;
}

/** Drops an offer that no statement took (the statement failed before asking for it). */
export function withdrawLocalInfile(name: string): void {
  offered.delete(name);
}

/** The connector's infileStreamFactory: the offered data as a stream, or an error for any other name. */
export function localInfileStream(name: string): Readable {
  const data = offered.get(name);
  if (!data) throw new Error(`LOAD DATA LOCAL INFILE asked for "${name}", which was not offered`);
  offered.delete(name);
  return Readable.from([data]);
}
