/**
 * The reproducible randomness of a round: each rater's reading order for each pass, and the
 * blind codes, all drawn from the round's stored seed. The generator is pure-rand's
 * xoroshiro128+ (a published, well-tested generator) seeded from a 32-bit FNV-1a hash of the
 * seed text and what is being drawn, so the same seed always gives the same orders and codes.
 */
import { uniformInt } from 'pure-rand/distribution/uniformInt'
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus'
import { randomBytes } from 'node:crypto'

/** 32-bit FNV-1a of a text (Fowler–Noll–Vo, the published offset basis and prime). */
function fnv1a32(text: string): number {
  let hash = 0x811c9dc5
  for (const byte of Buffer.from(text, 'utf8')) {
    hash ^= byte
    hash = Math.imul(hash, 0x01000193) >>> 0
  }
  return hash | 0
}

/** Fisher–Yates (Durstenfeld) shuffle of a copy, driven by the seeded generator. */
export function seededShuffle<T>(items: readonly T[], seed: string, stream: string): T[] {
  const rng = xoroshiro128plus(fnv1a32(`${seed}\u0000${stream}`))
  const shuffled = [...items]
  for (let i = shuffled.length - 1; i > 0; i -= 1) {
    const j = uniformInt(rng, 0, i)
    ;[shuffled[i], shuffled[j]] = [shuffled[j] as T, shuffled[i] as T]
  }
  return shuffled
}

/** A fresh seed for a round that was not given one. */
export function newRoundSeed(): string {
  return randomBytes(8).toString('hex')
}

/** The order in which `raterId` reads the films in pass `repetition`: a permutation of `imageIds`. */
export function raterOrder(
  imageIds: readonly number[],
  seed: string,
  raterId: number,
  repetition: number,
): number[] {
  return seededShuffle(imageIds, seed, `order:${raterId}:${repetition}`)
}

/**
 * Blind codes for every (film, pass) of a round: the pairs in a seeded order numbered 001, 002, …
 * so a code says nothing about the film's record, and a repeat never carries its first code.
 */
export function blindCodes(
  imageIds: readonly number[],
  repeats: number,
  seed: string,
): Map<string, string> {
  const pairs: string[] = []
  for (let repetition = 1; repetition <= repeats; repetition += 1) {
    for (const imageId of imageIds) pairs.push(`${imageId}:${repetition}`)
  }
  const width = Math.max(3, String(pairs.length).length)
  return new Map(
    seededShuffle(pairs, seed, 'codes').map((pair, index) => [
      pair,
      `F-${String(index + 1).padStart(width, '0')}`,
    ]),
  )
}

export const codeKey = (imageId: number, repetition: number) => `${imageId}:${repetition}`
