import { describe, expect, it } from 'vitest'
import { createProgressBar } from '../../../cli/progressBar'

function fakeStream(isTTY: boolean) {
  const written: string[] = []
  return { stream: { isTTY, write: (text: string) => written.push(text) } as unknown as NodeJS.WriteStream, written }
}

describe('createProgressBar', () => {
  it('when the stream is a terminal then it draws done/total and refusals, and clears the line at the end', () => {
    const { stream, written } = fakeStream(true)
    const bar = createProgressBar(4, stream)
    bar.update(4, 1)
    expect(written.at(-1)).toBe(`\r[${'#'.repeat(30)}] 4/4 files, 1 refused\x1b[K`)
    bar.end()
    expect(written.at(-1)).toBe('\r\x1b[K')
  })

  it('when the stream is not a terminal then it writes nothing at all', () => {
    const { stream, written } = fakeStream(false)
    const bar = createProgressBar(4, stream)
    bar.update(2, 0)
    bar.update(4, 0)
    bar.end()
    expect(written).toEqual([])
  })
})
