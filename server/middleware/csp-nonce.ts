import { randomBytes } from 'node:crypto'
import type { IncomingMessage, ServerResponse } from 'node:http'
import type { NextFunction, Request, Response } from 'express'

/**
 * What the built index.html holds where each response's nonce goes: Vite writes it (html.cspNonce
 * in vite.config.ts) on the page's script and stylesheet tags and on a
 * `<meta property="csp-nonce">` that Vite's loader and the client's start-up read.
 */
export const CSP_NONCE_PLACEHOLDER = 'ENDPLATE_CSP_NONCE'

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Locals {
      /** This response's Content-Security-Policy nonce (base64, 128 random bits). */
      cspNonce: string
    }
  }
}

/** Gives every response a fresh nonce, so the <style> tags PrimeVue injects need no 'unsafe-inline'. */
export function cspNonce(_req: Request, res: Response, next: NextFunction): void {
  res.locals.cspNonce = randomBytes(16).toString('base64')
  next()
}

/** The helmet directive value that allows exactly this response's nonce. */
export function nonceSource(_req: IncomingMessage, res: ServerResponse): string {
  // helmet passes Node's response; Express's is the same object.
  return `'nonce-${(res as Response).locals.cspNonce}'`
}
