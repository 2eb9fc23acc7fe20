import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs'
import { join } from 'node:path'
import { spawn } from 'node:child_process'
import { createServer } from 'node:net'
import { aptInstall, commandExists, run, succeeds } from './shell'

const MARIADBD = '/usr/sbin/mariadbd'

export interface MariaDbPaths {
  dataDir: string
  runDir: string
  socket: string
  pidFile: string
  errorLog: string
}

/** The project's own MariaDB layout: the data folder plus a run folder beside it. */
export function mariaDbPaths(dataDir: string): MariaDbPaths {
  const runDir = `${dataDir}-run`
  return {
    dataDir,
    runDir,
    socket: join(runDir, 'mysqld.sock'),
    pidFile: join(runDir, 'mysqld.pid'),
    errorLog: join(runDir, 'mysqld.err'),
  }
}

/** Installs MariaDB from Debian's packages when the server binary is missing. */
export async function ensureMariaDbInstalled(): Promise<void> {
  if (existsSync(MARIADBD) && commandExists('mariadb-install-db')) return
  console.log('MariaDB is not installed; installing mariadb-server from Debian ...')
  await aptInstall(['mariadb-server', 'mariadb-client'])
}

function rootClientArgs(paths: MariaDbPaths): string[] {
  return ['--no-defaults', `--socket=${paths.socket}`, '-uroot']
}

/** True when a server answers on the project's socket. */
export function isMariaDbRunning(paths: MariaDbPaths): boolean {
  return existsSync(paths.socket) && succeeds('mariadb-admin', [...rootClientArgs(paths), 'ping'])
}

async function initialiseDataDir(paths: MariaDbPaths): Promise<void> {
  if (existsSync(join(paths.dataDir, 'mysql'))) return
  console.log(`Initialising a MariaDB data folder in ${paths.dataDir} ...`)
  mkdirSync(paths.dataDir, { recursive: true })
  await run(
    'mariadb-install-db',
    [
      '--no-defaults',
      `--datadir=${paths.dataDir}`,
      '--user=root',
      '--auth-root-authentication-method=socket',
      '--skip-test-db',
    ],
    { stdio: ['ignore', 'ignore', 'inherit'] },
  )
}

async function waitUntilReady(paths: MariaDbPaths, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs
  while (Date.now() < deadline) {
    if (isMariaDbRunning(paths)) return
    await new Promise((resolveWait) => setTimeout(resolveWait, 100))
  }
  const log = existsSync(paths.errorLog) ? readFileSync(paths.errorLog, 'utf8').slice(-2000) : ''
  throw new Error(`MariaDB did not become ready within ${timeoutMs} ms.\n${log}`)
}

/** Whether something already listens on 127.0.0.1:port (another database, an old run). */
function isPortTaken(port: number): Promise<boolean> {
  return new Promise((resolvePort) => {
    const probe = createServer()
    probe.once('error', () => resolvePort(true))
    probe.once('listening', () => probe.close(() => resolvePort(false)))
    probe.listen(port, '127.0.0.1')
  })
}

/**
 * Starts the project's MariaDB bound to 127.0.0.1 on `port`, or reuses one already running from
 * an earlier start. Returns whether this call started it (and so should stop it).
 */
export async function startMariaDb(paths: MariaDbPaths, port: number): Promise<boolean> {
  await ensureMariaDbInstalled()
  if (isMariaDbRunning(paths)) return false
  if (await isPortTaken(port)) {
    throw new Error(
      `Port ${port} on 127.0.0.1 is already in use by another program, so the project's MariaDB cannot start. Stop that program or set DB_PORT in .env to a free port.`,
    )
  }
  await initialiseDataDir(paths)
  mkdirSync(paths.runDir, { recursive: true })
  rmSync(paths.socket, { force: true })
  const child = spawn(
    MARIADBD,
    [
      '--no-defaults',
      `--datadir=${paths.dataDir}`,
      '--user=root',
      '--bind-address=127.0.0.1',
      `--port=${port}`,
      `--socket=${paths.socket}`,
      `--pid-file=${paths.pidFile}`,
      `--log-error=${paths.errorLog}`,
      '--skip-name-resolve',
      '--character-set-server=utf8mb4',
      '--collation-server=utf8mb4_unicode_ci',
    ],
    // Detached: Ctrl-C in the terminal reaches our handler first, which shuts MariaDB down cleanly.
    { stdio: 'ignore', detached: true },
  )
  child.unref()
  await waitUntilReady(paths, 30_000)
  return true
}

/** Shuts the project's MariaDB down cleanly (flushes InnoDB) when it is running. */
export async function stopMariaDb(paths: MariaDbPaths): Promise<void> {
  if (!isMariaDbRunning(paths)) return
  await run('mariadb-admin', [...rootClientArgs(paths), 'shutdown'])
}

function sqlString(value: string): string {
  return `'${value.replace(/\\/g, '\\\\').replace(/'/g, "\\'")}'`
}

export interface DatabaseAccount {
  user: string
  password: string
}

/** The two accounts the project creates: the API's, and the schema owner's that migrates. */
export interface DatabaseAccounts {
  application: DatabaseAccount
  owner: DatabaseAccount
}

export function databaseAccounts(config: {
  DB_USER: string
  DB_PASSWORD: string
  DB_OWNER_USER: string
  DB_OWNER_PASSWORD: string
}): DatabaseAccounts {
  return {
    application: { user: config.DB_USER, password: config.DB_PASSWORD },
    owner: { user: config.DB_OWNER_USER, password: config.DB_OWNER_PASSWORD },
  }
}

/** Runs SQL as MariaDB's root over the project's socket (set-up, and tests that play an intruder). */
export async function runRootSql(paths: MariaDbPaths, sql: string): Promise<void> {
  await run('mariadb', [...rootClientArgs(paths), '-e', sql])
}

/**
 * Creates the databases (utf8mb4_unicode_ci) and both accounts for 127.0.0.1 with the given
 * passwords. Idempotent: an existing database keeps its data. The owner holds every right on
 * databases named like the given ones (`<prefix>_w<n>`, one per test worker, included), with
 * the right to grant; the application account gets no database-wide right here: migrations
 * grant it table by table (server/db/application-grants.ts). A database-wide grant left by an
 * earlier version of the scripts is removed, since it would include UPDATE and DELETE on the
 * audit trail.
 */
export async function ensureDatabases(
  paths: MariaDbPaths,
  databases: string[],
  accounts: DatabaseAccounts,
): Promise<void> {
  const { application, owner } = accounts
  const account = (user: string) => `${sqlString(user)}@'127.0.0.1'`
  const statements = [
    ...databases.map(
      (name) =>
        `CREATE DATABASE IF NOT EXISTS \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;`,
    ),
    ...[application, owner].flatMap(({ user, password }) => [
      `CREATE USER IF NOT EXISTS ${account(user)} IDENTIFIED BY ${sqlString(password)};`,
      `ALTER USER ${account(user)} IDENTIFIED BY ${sqlString(password)};`,
    ]),
    ...databases.map(
      (name) =>
        `GRANT ALL PRIVILEGES ON \`${name.replace(/_/g, '\\_')}%\`.* TO ${account(owner.user)} WITH GRANT OPTION;`,
    ),
    `DELETE FROM mysql.db WHERE User = ${sqlString(application.user)} AND Host = '127.0.0.1';`,
    'FLUSH PRIVILEGES;',
  ]
  await runRootSql(paths, statements.join(' '))
}
