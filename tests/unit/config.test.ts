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

  it('when the digest schedule is set then a five-field cron or off is taken and anything else is named', () => {
    expect(loadConfig(base)).toMatchObject({ DIGEST_SCHEDULE: '0 7 * * 1', DIGEST_TIMEZONE: 'UTC' })
    expect(loadConfig({ ...base, DIGEST_SCHEDULE: '30 6 * * 1-5', DIGEST_TIMEZONE: 'Europe/Berlin' })).toMatchObject({ DIGEST_SCHEDULE: '30 6 * * 1-5', DIGEST_TIMEZONE: 'Europe/Berlin' })
    expect(loadConfig({ ...base, DIGEST_SCHEDULE: 'off' }).DIGEST_SCHEDULE).toBe('off')
    expect(() => loadConfig({ ...base, DIGEST_SCHEDULE: 'every monday' })).toThrow(/DIGEST_SCHEDULE must be a cron expression of five fields/)
    expect(() => loadConfig({ ...base, DIGEST_SCHEDULE: '0 7 * *' })).toThrow(/DIGEST_SCHEDULE/)
    expect(() => loadConfig({ ...base, DIGEST_SCHEDULE: '0 24 * * 1' })).toThrow(/DIGEST_SCHEDULE .*hour 0–23/)
    expect(loadConfig({ ...base, DIGEST_SCHEDULE: '*/15 6-18 1,15 * 0' }).DIGEST_SCHEDULE).toBe('*/15 6-18 1,15 * 0')
    expect(() => loadConfig({ ...base, DIGEST_TIMEZONE: 'Mars/Olympus' })).toThrow(/DIGEST_TIMEZONE must be an IANA time zone/)
  })

  it('when the server is started with a bad value then it exits non-zero naming the variable', () => {
    const result = spawnSync('node_modules/.bin/tsx', ['server/main.ts'], { env: { ...process.env, ...base, PORT: 'seventy' }, encoding: 'utf8' })
    expect(result.status).toBe(78) // EX_CONFIG: `npm start` does not start it again
    expect(result.stderr).toContain('PORT')
    expect(result.stderr).not.toMatch(/at .*\.ts:\d+/) // a message, not a stack trace
  })
})
