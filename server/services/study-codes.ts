import { randomInt } from 'node:crypto'

// No 0/O, 1/I/L: codes are read aloud and copied by hand in research meetings.
const ALPHABET = '23456789ABCDEFGHJKMNPQRSTUVWXYZ'

/** A random pseudonym such as "EP-7KQ2MD"; it carries nothing about the patient. */
export function generateStudyCode(): string {
  let code = ''
  for (let i = 0; i < 6; i += 1) code += ALPHABET[randomInt(ALPHABET.length)]
  return `EP-${code}`
}
