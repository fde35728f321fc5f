import type pg from 'pg';

/** A pool or a client inside a transaction: bulk writes of the importers run on either. */
export type Queryable = Pick<pg.PoolClient, 'query'>;
