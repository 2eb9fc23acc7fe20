/**
 * The page's Content-Security-Policy nonce, from the `<meta property="csp-nonce">` Vite writes
 * and the server fills in per response. The browser hides the attribute's text after parsing;
 * the `nonce` property still holds it. Undefined in the development server, which sends no CSP.
 */
export function pageCspNonce(): string | undefined {
  const meta = document.querySelector<HTMLMetaElement>('meta[property="csp-nonce"]')
  return meta?.nonce || undefined
}
