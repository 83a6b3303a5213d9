import { spawnSync } from 'node:child_process'
import { describe, expect, it } from 'vitest'
import { ConfigError, loadConfig } from '../../server/config'

const base = { DATABASE_URL: 'postgres://postgres@127.0.0.1:5432/x' }

describe('loadConfig', () => {
  it('when only the database is given then the documented defaults apply', () => {
    const config = loadConfig(base)
    expect(config).toMatchObject({ PORT: 3000, HOST: '127.0.0.1', NODE_ENV: 'development', UPLOAD_LIMIT_MB: 200 })
  })

  it('when PORT is not a number then the error names PORT and the bad value', () => {
    expect(() => loadConfig({ ...base, PORT: 'abc' })).toThrow(ConfigError)
    expect(() => loadConfig({ ...base, PORT: 'abc' })).toThrow(/PORT .*"abc"/)
  })

  it('when DATABASE_URL is missing or not a postgres URL then the error names it', () => {
    expect(() => loadConfig({})).toThrow(/DATABASE_URL/)
    expect(() => loadConfig({ DATABASE_URL: 'mysql://x' })).toThrow(/DATABASE_URL must start with postgres/)
  })

  it('when two values are bad then both are named', () => {
    expect(() => loadConfig({ ...base, PORT: '70000', LOG_LEVEL: 'loud' })).toThrow(/PORT.*LOG_LEVEL|LOG_LEVEL.*PORT/)
  })

  it('when the server is started with a bad value then it exits non-zero naming the variable', () => {
    const result = spawnSync('node_modules/.bin/tsx', ['server/main.ts'], { env: { ...process.env, ...base, PORT: 'seventy' }, encoding: 'utf8' })
    expect(result.status).toBe(1)
    expect(result.stderr).toContain('PORT')
    expect(result.stderr).not.toMatch(/at .*\.ts:\d+/) // a message, not a stack trace
  })
})
