// Operators and types only: importing "@reelwright/db" opens nothing.
export * from 'drizzle-orm';
export type * from './schema';
export type {
  Db,
  DbHandle,
  DbQueryResult,
  DbQueryResultHKT,
  Driver,
  GetDbOptions,
  MigrateOptions,
  OpenDbOptions,
  Schema,
  SharedDbHandle,
  Tx,
} from './client';
