/** Reported by /api/health and stored with every computed reading. */
export const APP_VERSION = '0.1.0'
