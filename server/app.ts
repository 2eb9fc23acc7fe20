import { existsSync } from 'node:fs'
import { join } from 'node:path'
import express, { type Express } from 'express'
import helmet from 'helmet'
import cookieParser from 'cookie-parser'
import { pinoHttp } from 'pino-http'
import type { Logger } from 'pino'
import './auth/express-augment'
import type { AppConfig } from './config'
import type { Db } from './db/knex'
import { authenticate } from './middleware/authenticate'
import { errorHandler } from './middleware/error-handler'
import { clientPage } from './middleware/client-page'
import { cspNonce, nonceSource } from './middleware/csp-nonce'
import { notFoundHandler } from './middleware/not-found'
import { noStore } from './middleware/no-store'
import { sameOriginWrites } from './middleware/same-origin'
import { auditReads } from './middleware/audit-reads'
import { authRouter } from './routes/auth'
import { limitPerAddress } from './middleware/rate-limit'
import { refuseInvalidUtf8 } from './middleware/utf8-body'
import { healthRouter } from './routes/health'
import { patientsRouter } from './routes/patients'
import { visitsRouter } from './routes/visits'
import { usersRouter } from './routes/users'
import { auditEventsRouter } from './routes/audit-events'
import { measurementsRouter } from './routes/measurements'
import { imagesRouter } from './routes/images'
import { readingsRouter } from './routes/readings'
import { roundRatersRouter } from './routes/round-raters'
import { roundsRouter } from './routes/rounds'
import { plansRouter } from './routes/plans'
import { invitationsRouter } from './routes/invitations'
import { settingsRouter } from './routes/settings'
import { mailRouter } from './routes/mail'
import { systemClock, type Clock } from './clock'
import { comparisonsRouter } from './routes/comparisons'
import { reportsRouter } from './routes/reports'
import { studiesRouter } from './routes/studies'
import { exportsRouter } from './routes/exports'
import { imageDicomRouter } from './routes/image-dicom'
import { tokenSettingsOf } from './auth/session-token'
import { createLocalFileStore } from './storage/local-file-store'
import type { FileStore } from './storage/file-store'
import { projectRoot } from './project-root'
import { serializeError } from './logger'

export interface AppDependencies {
  db: Db
  config: AppConfig
  logger: Logger
  /** Folder of the built client; served when it exists. */
  clientDir?: string
  /** Where films live; the local uploads folder unless a test or deployment passes another. */
  store?: FileStore
  /** The current time for link expiry; tests pass a clock they can move. */
  now?: Clock
}

export function createApp({
  db,
  config,
  logger,
  clientDir = join(projectRoot, 'dist'),
  store = createLocalFileStore(config.uploadDirAbsolute),
  now = systemClock,
}: AppDependencies): Express {
  const app = express()
  app.disable('x-powered-by')
  app.set('trust proxy', 'loopback')
  // The public address decides: behind TLS the cookie is Secure and browsers are told to stay on
  // HTTPS, whatever NODE_ENV says.
  const servedOverHttps = config.publicUrl.startsWith('https:')

  app.use(cspNonce)
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          // WebAssembly image codecs need 'wasm-unsafe-eval'.
          'script-src': ["'self'", "'wasm-unsafe-eval'"],
          // PrimeVue's theme injects <style> tags, carrying the page's nonce; style attributes in
          // markup stay blocked (Vue, PrimeVue, Konva and chart.js set styles through the CSSOM).
          'style-src': ["'self'", nonceSource],
          'img-src': ["'self'", 'data:', 'blob:'],
          'worker-src': ["'self'", 'blob:'],
          'connect-src': ["'self'"],
          'frame-ancestors': ["'none'"],
          'upgrade-insecure-requests': null,
        },
      },
      // Only where PUBLIC_URL is https: a plain-HTTP site (127.0.0.1 in development) must not ask for it.
      strictTransportSecurity: servedOverHttps,
    }),
  )
  app.use(
    pinoHttp({
      logger,
      autoLogging: { ignore: (req) => req.url === '/api/health' },
      // Method and path only: headers, query strings and bodies can carry credentials or names.
      // The answer's status only: its headers (a session cookie among them) are no one's
      // business in a log, and writing them out was a large part of a small request's CPU.
      serializers: {
        req: (req) => ({ method: req.method, url: String(req.url).split('?')[0] }),
        res: (res) => ({ statusCode: res.statusCode }),
        err: serializeError,
      },
    }),
  )
  app.use(cookieParser())
  app.use(express.json({ limit: '2mb', verify: refuseInvalidUtf8 }))

  const session = { ...tokenSettingsOf(config), secureCookie: servedOverHttps }
  const requireSession = authenticate(db, session, now)

  const api = express.Router()
  api.use(noStore)
  api.use(sameOriginWrites(config.PUBLIC_URL))
  api.use('/health', healthRouter(db, requireSession))
  api.use(
    '/auth',
    authRouter({
      db,
      now,
      session,
      authenticate: requireSession,
      maxFailures: config.LOGIN_MAX_FAILURES,
      loginsPerMinute: config.LOGIN_RATE_LIMIT_PER_MINUTE,
      attemptsPerAccountHour: config.LOGIN_ATTEMPTS_PER_ACCOUNT_HOUR,
    }),
  )
  api.use(
    '/invitations',
    invitationsRouter({
      db,
      now,
      session,
      authenticate: requireSession,
      linkLimiter: limitPerAddress(
        db,
        'invitation-address',
        config.LOGIN_RATE_LIMIT_PER_MINUTE,
        'invitation requests',
      ),
    }),
  )
  api.use(requireSession)
  api.use(auditReads(db))
  api.use('/patients', patientsRouter(db))
  api.use('/patients', plansRouter(db))
  api.use(
    '/visits',
    visitsRouter(db, {
      store,
      uploadTmpDir: join(config.uploadDirAbsolute, 'tmp'),
      uploadMaxMb: config.UPLOAD_MAX_MB,
      uploadRequestMaxMb: config.UPLOAD_REQUEST_MAX_MB,
      uploadQueueLimit: config.UPLOAD_QUEUE_LIMIT,
    }),
  )
  api.use('/images', imagesRouter(db, store))
  api.use(readingsRouter(db))
  // Before the rounds router, whose /rounds/:id would take the path's last part for an id.
  api.use('/rounds', roundRatersRouter(db))
  api.use(roundsRouter(db, { store, now }))
  api.use('/users', usersRouter(db))
  api.use('/audit-events', auditEventsRouter(db))
  api.use('/measurements', measurementsRouter())
  api.use('/settings', settingsRouter(db))
  api.use('/mail', mailRouter(db, { fakeOn: config.MAIL_FAKE, now }))
  api.use('/comparisons', comparisonsRouter(db))
  api.use(reportsRouter(db, store))
  api.use('/studies', studiesRouter(db))
  api.use('/exports', exportsRouter(db))
  // UIDs of de-identified films are keyed by the server secret, so they cannot be traced back.
  api.use('/images', imageDicomRouter(db, store, config.JWT_SECRET))
  api.use(notFoundHandler)
  app.use('/api', api)

  if (existsSync(join(clientDir, 'index.html'))) {
    const page = clientPage(join(clientDir, 'index.html'))
    // Before the static files, so the page never goes out with its nonce placeholder.
    app.get('/index.html', page)
    app.use(
      express.static(clientDir, {
        index: false,
        maxAge: '1h',
        setHeaders: (res, path) => {
          // Vite fingerprints everything under assets/, so those files never change.
          if (path.includes('/assets/'))
            res.setHeader('Cache-Control', 'public, max-age=31536000, immutable')
        },
      }),
    )
    app.get('/{*splat}', page)
  }

  // Internal messages (which can quote SQL with patient data) reach the client in tests only;
  // the log always has them.
  app.use(errorHandler(config.NODE_ENV === 'test'))
  return app
}
