import { describe, expect, it } from 'vitest'
import bcrypt from 'bcryptjs'
import { passwordProblem } from '../../../shared/accounts/password-rules'

const EMAIL = 'wren.haldane@clinic.example'

describe('passwordProblem', () => {
  it('accepts 12 characters or more that leave out the e-mail name', () => {
    expect(passwordProblem('sagittal-balance', EMAIL)).toBeNull()
    expect(passwordProblem('x'.repeat(72), EMAIL)).toBeNull()
  })

  it('names the length rule, counting characters a reader sees (code points)', () => {
    expect(passwordProblem('short-pass1', EMAIL)).toBe('Use at least 12 characters.')
    // 12 emoji are 12 characters (24 UTF-16 units, 48 bytes).
    expect(passwordProblem('🦴'.repeat(12), EMAIL)).toBeNull()
  })

  it('refuses more than 72 bytes of UTF-8, the most bcrypt reads', async () => {
    expect(passwordProblem('a'.repeat(73), EMAIL)).toMatch(/at most 72 bytes/)
    // 'é' is 2 bytes in UTF-8 (RFC 3629): 36 of them fit, 37 do not.
    expect(passwordProblem('é'.repeat(36), EMAIL)).toBeNull()
    expect(passwordProblem('é'.repeat(37), EMAIL)).toMatch(/at most 72 bytes/)
    // Why: bcryptjs, an independent implementation, ignores everything after byte 72, so two
    // longer passwords that differ only there would both open the account.
    const hash = await bcrypt.hash(`${'a'.repeat(72)}1`, 4)
    expect(await bcrypt.compare(`${'a'.repeat(72)}2`, hash)).toBe(true)
  })

  it("refuses the e-mail address's name part in any letter case", () => {
    expect(passwordProblem('my-Wren.Haldane-2026', EMAIL)).toMatch(/name part of your e-mail/)
    // A one- or two-letter name part would forbid too much to be a rule worth having.
    expect(passwordProblem('a-long-enough-pass', 'al@clinic.example')).toBeNull()
  })
})
