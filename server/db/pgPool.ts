import pg from 'pg';

/**
 * A node-postgres pool that outlives its server restarting. pg-pool listens for 'error' only on
 * idle clients; a client handed out (a transaction waiting between two statements, a client held
 * across steps) emits 'error' when the server closes its connection, and an 'error' event with no
 * listener ends the process. Each client gets a listener for its whole life: the statement in
 * flight still fails with the cause, the client is marked unusable, and the pool drops it on
 * release, so the next query connects afresh.
 */
export function openPool(databaseUrl: string, { name, max }: { name: string; max?: number }, onLost: (error: Error) => void): pg.Pool {
  const pool = new pg.Pool({ connectionString: databaseUrl, application_name: name, ...(max === undefined ? {} : { max }) });
  pool.on('connect', (client) => client.on('error', onLost));
  // pg-pool re-emits an idle client's error here, after the client's own listener has reported
  // it; a listener must exist (or the process ends), but one report is enough.
  pool.on('error', () => undefined);
  return pool;
}
