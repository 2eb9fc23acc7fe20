/**
 * Text that a spreadsheet would run as a formula when it begins with =, +, -, @, a tab or a
 * carriage return (OWASP, CSV injection) gets a leading apostrophe, which spreadsheets show as
 * text. Only text cells pass through here: numbers are written as numbers, so a negative angle
 * stays a number.
 */
export function escapeSpreadsheetText(text: string): string {
  return /^[=+\-@\t\r]/.test(text) ? `'${text}` : text
}
