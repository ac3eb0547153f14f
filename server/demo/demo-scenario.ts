import type { TankInput } from '@shared/schemas/tanks'
import { defaultTargetsFor } from '@shared/schemas/tank-defaults'

/**
 * An invented business for the demo: Marrowfen Aquatics, a shop with a fish room across town.
 * Every name, address and person here is made up.
 */
export const DEMO_PASSWORD = 'tankwarden-demo'

export const DEMO_ORGANIZATION = 'Marrowfen Aquatics'

export const DEMO_SITES = [
  { key: 'shop', name: 'Marrowfen shop floor', timeZone: 'Europe/Berlin', address: '12 Pike Street (invented)' },
  { key: 'fishroom', name: 'Cedar Row fish room', timeZone: 'Europe/Berlin', address: 'Unit 4, Cedar Row (invented)' },
  // Clients' own sites, where the business looks after their tanks (see demo-clients.ts).
  { key: 'quay', name: 'Harbourlight — Quay Road surgery', timeZone: 'Europe/Berlin', address: '3 Quay Road (invented)' },
  { key: 'mill', name: 'Harbourlight — Mill Lane clinic', timeZone: 'Europe/Berlin', address: '41 Mill Lane (invented)' },
  { key: 'alder', name: 'Palesworth home', timeZone: 'Europe/Berlin', address: '27 Alder Close (invented)' },
] as const

export const DEMO_USERS = [
  { email: 'owner@marrowfen.example', name: 'Ottilie Fenwright', role: 'owner', sites: [] },
  { email: 'keeper@marrowfen.example', name: 'Ravi Okonjo', role: 'keeper', sites: [] },
  { email: 'keeper2@marrowfen.example', name: 'Maren Lindqvist-Hale', role: 'keeper', sites: [] },
  { email: 'viewer@marrowfen.example', name: 'Tobias Quillfeather', role: 'viewer', sites: ['fishroom'] },
] as const

/** The sensor node of each demo tank; the simulator finds it by this name and sends as it. */
export const DEMO_NODE_NAME = 'Simulated node'
/** What the simulator reports at by default (its --interval). */
export const DEMO_NODE_INTERVAL_SECONDS = 10

type DemoTank = Omit<TankInput, 'siteId' | 'clientId'> & { site: (typeof DEMO_SITES)[number]['key']; client?: 'harbour' | 'alder' }

const rect = (lengthCm: number, widthCm: number, heightCm: number) => ({ shape: 'rectangular', lengthCm, widthCm, heightCm }) as const

const base = { filter: '', media: '', notes: '', substrateDepthCm: 5, volumeLitres: null, sortOrder: 0 }

export const DEMO_TANKS: DemoTank[] = [
  {
    ...base,
    site: 'shop',
    name: 'Display 1 — community',
    kind: 'tropical_freshwater',
    stage: 'established',
    dimensions: rect(120, 45, 55),
    heater: { watts: 300, setPointC: 26, topCm: 30 },
    lightSchedule: { on: '09:00', off: '20:00' },
    filter: 'External canister',
    media: 'Sponge, ceramic rings, carbon',
    sortOrder: 1,
  },
  {
    ...base,
    site: 'shop',
    name: 'Display 2 — planted scape',
    kind: 'planted',
    stage: 'established',
    dimensions: rect(90, 45, 45),
    heater: { watts: 200, setPointC: 25, topCm: 24 },
    lightSchedule: { on: '10:00', off: '18:00' },
    filter: 'External canister',
    media: 'Sponge, sintered glass',
    sortOrder: 2,
  },
  {
    ...base,
    site: 'shop',
    name: 'Sales row A1',
    kind: 'tropical_freshwater',
    stage: 'established',
    dimensions: rect(60, 40, 40),
    heater: { watts: 100, setPointC: 25.5, topCm: 22 },
    lightSchedule: { on: '09:00', off: '19:00' },
    filter: 'Sponge (air-driven)',
    sortOrder: 3,
  },
  {
    ...base,
    site: 'shop',
    name: 'Sales row A2',
    kind: 'tropical_freshwater',
    stage: 'cycling',
    dimensions: rect(60, 40, 40),
    heater: { watts: 100, setPointC: 25.5, topCm: 22 },
    lightSchedule: { on: '09:00', off: '19:00' },
    filter: 'Sponge (air-driven)',
    notes: 'Set up a month ago; fishless cycle running.',
    sortOrder: 4,
  },
  {
    ...base,
    site: 'shop',
    name: 'Goldfish bowl front',
    kind: 'coldwater',
    stage: 'established',
    dimensions: { shape: 'bow_front', lengthCm: 100, widthCm: 35, bowCm: 10, heightCm: 50 },
    heater: null,
    lightSchedule: { on: '09:00', off: '19:00' },
    filter: 'Hang-on-back',
    // Unheated, it follows the shop's room (up to 23 °C of an afternoon): its band is its fancy goldfish's, not the kind's default.
    targets: { ...defaultTargetsFor('coldwater'), temperature: { min: 10, max: 24 } },
    notes: 'Unheated; follows the room. Fancy goldfish, kept up to 24 °C.',
    sortOrder: 5,
  },
  {
    ...base,
    site: 'shop',
    name: 'Reef display',
    kind: 'marine',
    stage: 'established',
    dimensions: rect(150, 60, 60),
    heater: { watts: 2 * 300, setPointC: 25.5, topCm: 35 },
    lightSchedule: { on: '11:00', off: '21:00' },
    filter: 'Sump with protein skimmer',
    media: 'Live rock, filter floss',
    sortOrder: 6,
  },
  {
    ...base,
    site: 'fishroom',
    name: 'Quarantine Q1',
    kind: 'tropical_freshwater',
    stage: 'quarantine',
    dimensions: rect(80, 35, 40),
    heater: { watts: 150, setPointC: 26.5, topCm: 25 },
    lightSchedule: { on: '08:00', off: '16:00' },
    filter: 'Sponge (air-driven)',
    notes: 'Arrivals held here before the shop floor.',
    sortOrder: 1,
  },
  {
    ...base,
    site: 'fishroom',
    name: 'Brackish B1',
    kind: 'brackish',
    stage: 'established',
    dimensions: rect(100, 40, 45),
    heater: { watts: 200, setPointC: 26, topCm: 28 },
    lightSchedule: { on: '08:00', off: '18:00' },
    filter: 'External canister',
    sortOrder: 2,
  },
  {
    ...base,
    site: 'fishroom',
    name: 'Breeding cylinder C1',
    kind: 'tropical_freshwater',
    stage: 'established',
    dimensions: { shape: 'cylinder', diameterCm: 50, heightCm: 60 },
    heater: { watts: 150, setPointC: 27, topCm: 30 },
    lightSchedule: { on: '08:00', off: '18:00' },
    filter: 'Sponge (air-driven)',
    sortOrder: 3,
  },
  {
    ...base,
    site: 'fishroom',
    name: 'Spare tub S1',
    kind: 'coldwater',
    stage: 'empty',
    dimensions: null,
    volumeLitres: 200,
    heater: null,
    lightSchedule: null,
    notes: 'Dry; kept for overflow stock.',
    sortOrder: 4,
  },
  {
    ...base,
    site: 'quay',
    client: 'harbour',
    name: 'Waiting room reef',
    kind: 'marine',
    stage: 'established',
    dimensions: rect(100, 50, 50),
    heater: { watts: 250, setPointC: 25.5, topCm: 30 },
    lightSchedule: { on: '08:00', off: '19:00' },
    filter: 'Sump with skimmer',
    media: 'Live rock, filter floss',
    sortOrder: 1,
  },
  {
    ...base,
    site: 'mill',
    client: 'harbour',
    name: 'Mill Lane lobby tank',
    kind: 'tropical_freshwater',
    stage: 'established',
    dimensions: rect(80, 35, 45),
    heater: { watts: 150, setPointC: 25, topCm: 25 },
    lightSchedule: { on: '08:00', off: '18:00' },
    filter: 'Hang-on-back',
    media: 'Sponge, carbon',
    sortOrder: 1,
  },
  {
    ...base,
    site: 'alder',
    client: 'alder',
    name: 'Living room community tank',
    kind: 'tropical_freshwater',
    stage: 'established',
    dimensions: rect(60, 30, 36),
    heater: { watts: 75, setPointC: 24.5, topCm: 20 },
    lightSchedule: { on: '11:00', off: '19:00' },
    filter: 'External canister',
    media: 'Sponge, sintered glass',
    sortOrder: 1,
  },
]

/** Who is on duty: Ravi days on weekdays, Maren nights and weekends, at both sites (invented). */
export const DEMO_ROSTER = [
  ...[0, 1, 2, 3, 4].map((weekday) => ({ email: 'keeper@marrowfen.example', weekday, start: '07:00', end: '19:00' })),
  ...[0, 1, 2, 3, 4].map((weekday) => ({ email: 'keeper2@marrowfen.example', weekday, start: '19:00', end: '07:00' })),
  ...[5, 6].map((weekday) => ({ email: 'keeper2@marrowfen.example', weekday, start: '07:00', end: '07:00' })),
]
