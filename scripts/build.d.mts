/** Types of scripts/build.mjs (plain Node, so `npm start` can run it before anything else). */
export function codeBuildIsStale(): boolean
export function buildCode(): Promise<void>
export function buildCodeIfStale(options?: { announce?: boolean }): Promise<boolean>
