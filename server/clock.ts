/** The current time, injectable so that tests can move it (token expiry, mail retries). */
export type Clock = () => Date

export const systemClock: Clock = () => new Date()
