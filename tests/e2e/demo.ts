// The seeded demo people the journeys sign in as (see seeds/demo.ts).
import { DEMO_FIRM, DEMO_PEOPLE, SECOND_FIRM, type DemoPerson } from '../../seeds/demo'

function person(key: string): DemoPerson {
  const p = DEMO_PEOPLE.find(x => x.key === key)
  if (!p) throw new Error(`no demo person ${key} in seeds/demo.ts`)
  return p
}

export const OWNER = person('owner')
export const ACCOUNTANT = person('accountant')
export const CREW = person('crew')
export const OFFICE = person('office')
export const FIRM_NAME = DEMO_FIRM.tradingName
export const SECOND_FIRM_NAME = SECOND_FIRM.tradingName

export const firstName = (p: { name: string }) => p.name.split(' ')[0]!
