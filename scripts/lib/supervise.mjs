// Keep a child process running: `npm start` uses it for the server, so a crash is healed in a second
// while the database stays up. Plain Node (no dependencies).

/** Exit code a process uses for "bad configuration" (sysexits EX_CONFIG): starting again cannot help. */
export const EXIT_CONFIG = 78

/**
 * Run `start()` (which returns a ChildProcess) until it ends cleanly (exit 0), ends because we asked it
 * to (`isStopping()` true), or reports bad configuration; after any other end (an error code, a kill)
 * start it again after `delayMs`. `maxCrashes` crashes within `windowMs` mean something is broken: give up.
 * Resolves with the last exit code.
 */
export async function supervise({ start, isStopping = () => false, onCrash = () => {}, delayMs = 1000, maxCrashes = 5, windowMs = 60_000 }) {
  const crashes = []
  for (;;) {
    const child = start()
    const { exitCode, signal } = await new Promise((resolve) => child.on('exit', (code, sig) => resolve({ exitCode: code, signal: sig })))
    if (isStopping() || exitCode === 0 || exitCode === EXIT_CONFIG) return exitCode ?? 0
    const now = Date.now()
    crashes.push(now)
    while (crashes[0] < now - windowMs) crashes.shift()
    const givingUp = crashes.length >= maxCrashes
    onCrash({ exitCode, signal, givingUp })
    if (givingUp) return exitCode || 1
    await new Promise((resolve) => setTimeout(resolve, delayMs))
  }
}
