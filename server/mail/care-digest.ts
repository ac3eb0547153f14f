import type { CareDueStatus } from '@shared/care/due'
import type { QuarantineStatus } from '@shared/care/livestock'
import { stockProblem } from '@shared/equipment/stock-words'
import { plural } from '@shared/plural'
import type { PublicConsumable } from '@shared/schemas/equipment'
import { button, escapeHtml, layout, oneLine, safeUrl } from './templates/html'
import type { RenderedMail } from './types'

const ACCENT = '#11606B'
const STATUS_COLOURS: Record<Exclude<CareDueStatus, 'later'>, string> = { overdue: '#b42318', due_today: '#9a5b00', due_soon: '#3e4c59' }

export type DigestTask = { title: string; status: Exclude<CareDueStatus, 'later'>; dueOn: string; daysUntilDue: number }
export type DigestTank = { name: string; url: string; tasks: DigestTask[] }
export type DigestWatch = { name: string; url: string; quarantine: QuarantineStatus | null; watchUntilText: string | null }
/** A supply at or below its low level, or past its expiry date. */
export type DigestSupply = Pick<PublicConsumable, 'name' | 'quantity' | 'unit' | 'lowAt' | 'expiresOn' | 'low' | 'expired'>

export type CareDigestInput = {
  siteName: string
  /** The site's calendar day the digest is for, e.g. "Wednesday 2 December 2026". */
  dayLabel: string
  tanks: DigestTank[]
  watch: DigestWatch[]
  supplies: DigestSupply[]
  suppliesUrl: string
  careTodayUrl: string
}

/** "overdue by 3 days", "due today", "due tomorrow", "due in 2 days". */
export function dueWords(task: Pick<DigestTask, 'status' | 'daysUntilDue'>): string {
  const days = Math.abs(task.daysUntilDue)
  if (task.status === 'overdue') return `overdue by ${days} ${days === 1 ? 'day' : 'days'}`
  if (task.status === 'due_today') return 'due today'
  return days === 1 ? 'due tomorrow' : `due in ${days} days`
}

export function watchWords(w: Pick<DigestWatch, 'quarantine' | 'watchUntilText'>): string[] {
  const lines: string[] = []
  const q = w.quarantine
  if (q && q.daysRemaining !== null) {
    lines.push(
      q.daysRemaining > 0
        ? `quarantine day ${(q.daysIn ?? 0) + 1} of ${q.days}, ${q.daysRemaining} ${q.daysRemaining === 1 ? 'day' : 'days'} remaining`
        : `quarantine of ${q.days} days is over`,
    )
  }
  if (w.watchUntilText) lines.push(`new arrivals: watch closely until ${w.watchUntilText}`)
  return lines
}

const link = (url: string, text: string) => `<a href="${escapeHtml(safeUrl(url))}" style="color:#1f2933">${escapeHtml(text)}</a>`
/** A heading over a list, both already HTML; nothing at all without items. */
const section = (heading: string, items: string[], marginTop = 20) =>
  items.length
    ? `<h3 style="margin:${marginTop}px 0 4px;font-size:15px">${heading}</h3><ul style="margin:0;padding-left:20px">${items.map((item) => `<li>${item}</li>`).join('')}</ul>`
    : ''

const countOf = (tanks: DigestTank[], status: DigestTask['status']) => tanks.reduce((n, t) => n + t.tasks.filter((x) => x.status === status).length, 0)

/** The morning list of care work for one site, for the people on duty. Every name is escaped in the HTML. */
export function careDigest(i: CareDigestInput): RenderedMail {
  const overdue = countOf(i.tanks, 'overdue')
  const today = countOf(i.tanks, 'due_today')
  const soon = countOf(i.tanks, 'due_soon')
  const reorder = i.supplies.length && `${plural(i.supplies.length, 'supply', 'supplies')} to reorder`
  const summary = [overdue && `${overdue} overdue`, today && `${today} due today`, soon && `${soon} due soon`, reorder].filter(Boolean).join(', ')
  const lead = `Care work at ${i.siteName} for ${i.dayLabel}: ${summary || 'nothing due'}.`
  const safety = 'Unplug heaters, pumps and lights before hands go in the water, and follow the product labels for anything you dose.'

  const text = [
    lead,
    '',
    ...i.tanks.flatMap((tank) => [`${tank.name} (${safeUrl(tank.url)})`, ...tank.tasks.map((t) => `  - ${t.title}: ${dueWords(t)}`), '']),
    ...(i.watch.length ? ['Worth a look:', ...i.watch.map((w) => `  - ${w.name}: ${watchWords(w).join('; ')}`), ''] : []),
    ...(i.supplies.length ? [`Supplies to reorder (${safeUrl(i.suppliesUrl)}):`, ...i.supplies.map((s) => `  - ${s.name}: ${stockProblem(s)}`), ''] : []),
    `Mark tasks done: ${safeUrl(i.careTodayUrl)}`,
    '',
    safety,
  ].join('\n')

  const tankBlocks = i.tanks
    .map((tank) =>
      section(
        link(tank.url, tank.name),
        tank.tasks.map((t) => `${escapeHtml(t.title)}: <strong style="color:${STATUS_COLOURS[t.status]}">${escapeHtml(dueWords(t))}</strong>`),
        16,
      ),
    )
    .join('')
  const watchBlock = section(
    'Worth a look',
    i.watch.map((w) => `${link(w.url, w.name)}: ${escapeHtml(watchWords(w).join('; '))}`),
  )
  const suppliesBlock = section(
    link(i.suppliesUrl, 'Supplies to reorder'),
    i.supplies.map((s) => `${escapeHtml(s.name)}: ${escapeHtml(stockProblem(s))}`),
  )

  return {
    subject: oneLine(`Care today at ${i.siteName}: ${summary || 'nothing due'}`),
    text,
    html: layout({
      heading: `Care today at ${i.siteName}`,
      accent: ACCENT,
      footer: 'You get this because you are on duty at this site this morning.',
      body: [
        `<p style="margin:0 0 8px">${escapeHtml(lead)}</p>`,
        tankBlocks,
        watchBlock,
        suppliesBlock,
        `<p style="margin-top:16px">${button('Open Care today', i.careTodayUrl, ACCENT)}</p>`,
        `<p style="color:#52606d;font-size:12px">${escapeHtml(safety)}</p>`,
      ].join(''),
    }),
  }
}
