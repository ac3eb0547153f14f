// The build report as a PDF, in the client report's fonts and colours (pdf.ts).
import { substrateMaterial } from '@shared/build/materials'
import { buildDay } from '@shared/build/timeline'
import { formatCalendarDay as day, formatLocalDate, localDateAt } from '@shared/time'
import { READINGS_ARE_AIDS } from '../mail'
import type { BuildReport } from './report-data'
import { COLOURS, openDocument, section, write, type Doc } from '../reports'

const n = (value: number, digits = 1) => value.toFixed(digits)
const METRIC_WORDS: Record<string, string> = { temperature: '°C', ph: 'pH', ammonia: 'ammonia', nitrite: 'nitrite', nitrate: 'nitrate' }

function shapeText(report: BuildReport) {
  const d = report.tank.dimensions
  if (!d) return `${n(report.tank.volumeLitres, 0)} L`
  if (d.shape === 'cylinder') return `cylinder Ø${d.diameterCm} × ${d.heightCm} cm`
  return `${d.lengthCm} × ${d.widthCm} × ${d.heightCm} cm${d.shape === 'bow_front' ? ` with a ${d.bowCm} cm bow` : ''}`
}

/** Lines of each section, kept apart from the drawing so the mail can reuse them. */
export function buildReportLines(report: BuildReport) {
  const { build, figures } = report
  const plan = build.plan
  const zone = report.tank.timeZone
  const equipment = [
    `Filter: ${plan.filter.name || 'not named'}; media in the order the water passes them: ${plan.filter.media.join(' → ') || 'none listed'}`,
    `Heater: ${plan.heater.watts ?? figures.heater.watts} W (suggested ${figures.heater.watts} W: ${figures.heater.rule}); set point ${n(plan.heater.setPointC)} °C; top at most ${n(figures.heater.topMaxCm)} cm above the tank floor, fully under water`,
    plan.light ? `Light: on ${plan.light.on}, off ${plan.light.off}` : 'Light: no schedule',
  ]
  const substrate = figures.substrate.layers.map(
    (l) =>
      `${substrateMaterial(l.material)?.label ?? l.material}: ${n(l.depthCm)} cm, ${n(l.litres)} L, ${n(l.kg)} kg${l.bags !== null ? `, ${l.bags} bag${l.bags === 1 ? '' : 's'}` : ''}`,
  )
  if (figures.substrate.layers.length)
    substrate.push(`Bed in all: ${n(figures.substrate.depthCm)} cm, ${n(figures.substrate.litres)} L, ${n(figures.substrate.kg)} kg`)
  const hardscape = figures.hardscape.items.map((h) => `${h.label || h.kind} (${h.kind}): ${n(h.kg)} kg, ${n(h.litres)} L`)
  const water = [
    `Water after substrate and hardscape: ${n(figures.waterLitres)} L`,
    figures.conditioner
      ? `Conditioner${plan.water.conditioner ? ` (${plan.water.conditioner})` : ''}: ${n(figures.conditioner.amount)} ${figures.conditioner.unit} for ${n(figures.conditioner.forLitres)} L, from the label rate`
      : 'Conditioner: no label rate entered',
    `Filled weight about ${n(figures.weight.totalKg, 0)} kg (glass ${n(figures.weight.glassKg)}, water ${n(figures.weight.waterKg)}, substrate ${n(figures.weight.substrateKg)}, hardscape ${n(figures.weight.hardscapeKg)}), ${n(figures.weight.loadKgPerM2, 0)} kg/m² over the tank's footprint`,
  ]
  const steps = build.steps.map(
    (s) =>
      `Day ${s.day}${s.untilDay && s.untilDay > s.day ? `–${s.untilDay}` : ''} · ${s.doneAt ? `done ${day(s.doneAt, zone)}` : `due ${s.dueOn}`} · ${s.title}`,
  )
  const tests = report.tests.map(
    (t) =>
      `${day(t.at, zone)} · ${Object.entries(t.values)
        .map(([m, v]) => (m === 'temperature' ? `${n(v)} °C` : m === 'ph' ? `pH ${n(v, 2)}` : `${METRIC_WORDS[m] ?? m} ${n(v, 2)} mg/L`))
        .join(', ')}`,
  )
  const livestock = report.livestock.map((l) => `${day(l.addedAt, zone)} · ${l.count} × ${l.name}${l.removed ? ' (removed since)' : ''}`)
  // Each photo under the build day it was taken on, so the pictures read as the steps went.
  const buildDayOf = (iso: string) => (build.filledOn ? buildDay(build.filledOn, formatLocalDate(localDateAt(zone, Date.parse(iso)))) : null)
  const photos = report.photos.map(
    (p) => `${buildDayOf(p.takenAt) !== null ? `Day ${buildDayOf(p.takenAt)} · ` : ''}${day(p.takenAt, zone)} · ${p.caption || 'photo'}`,
  )
  const care = report.carePlan.map((c) => `${c.title}: ${c.every}`)
  const cautions = [...figures.cautions.weight, ...figures.cautions.electrical, figures.cautions.label, READINGS_ARE_AIDS]
  // The report font's Latin subset has no →; › reads the same way.
  const arrows = (list: string[]) => list.map((line) => line.replace(/→/g, '›'))
  return {
    equipment: arrows(equipment),
    substrate,
    hardscape,
    water,
    steps: arrows(steps),
    tests,
    livestock,
    photos,
    care,
    cautions,
  }
}

function header(doc: Doc, report: BuildReport) {
  const { build } = report
  doc.fillColor(COLOURS.muted)
  write(doc, `Tankwarden build report · ${report.tank.siteName}`, 'body', 9)
  doc.fillColor(COLOURS.accent)
  write(doc, report.tank.name, 'bold', 15)
  doc.fillColor(COLOURS.muted)
  const status = build.finishedAt
    ? `finished ${day(build.finishedAt, report.tank.timeZone)}`
    : build.day !== null
      ? `build day ${build.day} of about ${build.aboutDays ?? '?'}`
      : 'planned, not yet filled'
  write(doc, `${shapeText(report)} · ${build.filledOn ? `filled on ${build.filledOn} · ` : ''}${status}`, 'body', 9)
  doc.moveDown(0.6)
}

export async function renderBuildReportPdf(report: BuildReport, options: { compress?: boolean } = {}): Promise<Buffer> {
  const { doc, done } = openDocument(`Tankwarden build report: ${report.tank.name}`, new Date(report.generatedAt), options)
  const lines = buildReportLines(report)
  header(doc, report)
  section(doc, 'Equipment', lines.equipment, '')
  section(doc, 'Substrate', lines.substrate, 'No substrate planned.')
  section(doc, 'Hardscape', lines.hardscape, 'No hardscape.')
  section(doc, 'Water and weight', lines.water, '')
  section(doc, 'Timeline', lines.steps, 'Not filled yet: the timeline starts on the fill day.')
  section(doc, 'Readings through cycling', lines.tests, 'No test-kit readings yet.')
  section(doc, 'Livestock', lines.livestock, 'No livestock added yet.')
  section(doc, 'Photos', lines.photos, 'No photos of this build.')
  section(doc, 'Care plan from here', lines.care, 'No care tasks set.')
  doc.fillColor(COLOURS.muted)
  section(doc, 'Cautions', lines.cautions, '')
  doc.end()
  return done
}
