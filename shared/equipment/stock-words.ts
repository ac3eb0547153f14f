// Why a supply needs a look, in the words Care today and the morning digest both use.
import type { PublicConsumable } from '../schemas/equipment'
import { plainNumber } from '../plain-number'
import { formatCalendarDay } from '../time'

type StockState = Pick<PublicConsumable, 'quantity' | 'unit' | 'lowAt' | 'expiresOn' | 'low' | 'expired'>

/** "expired 3 Mar 2026: replace before the next test · 2 pads left (low at 3)". */
export function stockProblem(a: StockState): string {
  const parts: string[] = []
  if (a.expired && a.expiresOn) parts.push(`expired ${formatCalendarDay(`${a.expiresOn}T12:00:00Z`, 'UTC')}: replace before the next test`)
  if (a.low) parts.push(`${plainNumber(a.quantity)} ${a.unit} left (low at ${plainNumber(a.lowAt ?? 0)})`)
  return parts.join(' · ')
}
