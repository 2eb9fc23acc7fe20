import { readFileSync } from 'node:fs'
import type { Request, Response } from 'express'
import { CSP_NONCE_PLACEHOLDER } from './csp-nonce'

/**
 * Serves the client's index.html with this response's CSP nonce written in. The file is read
 * once: it only changes with a new build, and a new build comes with a restart.
 */
export function clientPage(indexHtmlPath: string) {
  const template = readFileSync(indexHtmlPath, 'utf8')
  return (_req: Request, res: Response): void => {
    res.setHeader('Cache-Control', 'no-cache')
    res.type('html').send(template.replaceAll(CSP_NONCE_PLACEHOLDER, res.locals.cspNonce))
  }
}
