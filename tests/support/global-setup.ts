/**
 * Vitest global set-up for the API and browser projects: the project's real MariaDB (never a
 * mock), started when it is not already running and stopped afterwards if started here.
 */
import { ensureEnvFile } from '../../server/cli/env-file'

export default async function setup(): Promise<() => Promise<void>> {
  ensureEnvFile()
  const { config } = await import('../../server/config')
  const { databaseAccounts, ensureDatabases, mariaDbPaths, startMariaDb, stopMariaDb } =
    await import('../../server/cli/mariadb')
  const paths = mariaDbPaths(config.dataDirAbsolute)
  const startedHere = await startMariaDb(paths, config.DB_PORT)
  await ensureDatabases(paths, [config.DB_TEST_NAME], databaseAccounts(config))
  return async () => {
    if (startedHere) await stopMariaDb(paths)
  }
}
