// Puts a route's reads on the MariaDB replicas (server/db-replicas.ts): the board and history routes,
// whose queries are the heaviest reads and never part of a write. Without replicas it changes nothing.
import type { RequestHandler } from 'express';
import { readFromReplica } from '../db-replicas';

/** Runs the rest of the request inside `readFromReplica`; work it leaves running after its answer reads the primary. */
export const replicaReads = (): RequestHandler => (_req, res, next) =>
  readFromReplica((done) => {
    res.once('close', done);
    next();
  });
