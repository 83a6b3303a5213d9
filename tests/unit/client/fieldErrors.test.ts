/** Form messages in one style (issue 13): sentences, "X is required." for a missing value. Our own rule. */
import { describe, expect, it } from 'vitest'
import { cavityInputSchema } from '../../../shared/api/cavitySchemas'
import { fieldErrorsOf } from '../../../src/components/forms/fieldErrors'

describe('fieldErrorsOf', () => {
  it('when a cavity form lacks its length and has an empty name then both messages are sentences in the same style', () => {
    const parsed = cavityInputSchema.safeParse({ name: '  ', wavelengthNm: 1064, roc1Mm: null, roc2Mm: 500 })
    expect(parsed.success).toBe(false)
    const errors = fieldErrorsOf(parsed.success ? [] : parsed.error.issues, { name: 'Name', lengthMm: 'Length' })
    expect(errors).toEqual({ name: 'Name must not be empty.', lengthMm: 'Length is required.' })
  })
})
