/** A one-line progress bar on stderr, drawn only when stderr is a terminal (nothing at all otherwise). */
export interface ProgressBar {
  update(done: number, refused: number): void
  end(): void
}

export function createProgressBar(total: number, stream: NodeJS.WriteStream = process.stderr): ProgressBar {
  if (!stream.isTTY) return { update() {}, end() {} }
  const width = 30
  let lastDrawn = 0
  return {
    update(done, refused) {
      const now = Date.now()
      if (done < total && now - lastDrawn < 100) return
      lastDrawn = now
      const filled = Math.round((width * done) / total)
      const note = refused > 0 ? `, ${refused} refused` : ''
      stream.write(`\r[${'#'.repeat(filled)}${'.'.repeat(width - filled)}] ${done}/${total} files${note}\x1b[K`)
    },
    end() {
      stream.write('\r\x1b[K')
    },
  }
}
