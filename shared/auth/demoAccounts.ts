/** The invented demo people (one per role) and their one documented password, from demoAccounts.json. */
import type { Role } from './permissions'
import demoAccountsJson from './demoAccounts.json'

export interface DemoPerson {
  email: string
  name: string
  role: Role
}

/** The demo password shared by every demo person (development only; listed in the README). */
export const demoPassword: string = demoAccountsJson.password
export const demoPeople: readonly DemoPerson[] = demoAccountsJson.people as DemoPerson[]
