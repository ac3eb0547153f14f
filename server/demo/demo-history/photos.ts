// Demo tank photos, drawn here as SVG and rasterised with sharp: no picture comes from anywhere else.
import type { TankKind } from '@shared/schemas/tanks'
import { mulberry32, seedFrom, type Random } from '../../../simulator/model/random'

const WIDTH = 1200
const HEIGHT = 800

const WATER: Record<TankKind, [string, string]> = {
  tropical_freshwater: ['#5fb3c9', '#1f5f73'],
  planted: ['#7cc49a', '#23553a'],
  coldwater: ['#8ec5d6', '#3a6f80'],
  brackish: ['#8fbfb0', '#3f6b5e'],
  marine: ['#3da6e0', '#0b3a78'],
}
const FISH = ['#f2a541', '#e4572e', '#f3f0e2', '#4cc9f0', '#ffd23f', '#b56576']

const n = (value: number) => value.toFixed(1)

function plant(random: Random, x: number, marine: boolean): string {
  const height = 180 + random() * 260
  if (marine) {
    const colour = ['#ff7f7f', '#c77dff', '#80ed99', '#ffb4a2'][Math.floor(random() * 4)]
    return `<ellipse cx="${n(x)}" cy="${n(HEIGHT - 120 - height / 4)}" rx="${n(30 + random() * 40)}" ry="${n(height / 4)}" fill="${colour}" opacity="0.85"/>`
  }
  const sway = (random() - 0.5) * 80
  const green = ['#2d6a4f', '#40916c', '#52b788', '#74c69d'][Math.floor(random() * 4)]
  return `<path d="M${n(x)} ${HEIGHT - 110} q ${n(sway)} ${n(-height / 2)} ${n(sway / 2)} ${n(-height)}" stroke="${green}" stroke-width="${n(10 + random() * 14)}" fill="none" stroke-linecap="round"/>`
}

function fish(random: Random): string {
  const x = 120 + random() * (WIDTH - 240)
  const y = 140 + random() * (HEIGHT - 380)
  const size = 18 + random() * 26
  const dir = random() < 0.5 ? -1 : 1
  const colour = FISH[Math.floor(random() * FISH.length)]
  const body = `<ellipse cx="0" cy="0" rx="${n(size)}" ry="${n(size * 0.45)}" fill="${colour}"/>`
  const tail = `<path d="M${n(-size * 0.9)} 0 l ${n(-size * 0.6)} ${n(-size * 0.45)} v ${n(size * 0.9)} z" fill="${colour}"/>`
  const eye = `<circle cx="${n(size * 0.55)}" cy="${n(-size * 0.1)}" r="${n(size * 0.09)}" fill="#111"/>`
  return `<g transform="translate(${n(x)} ${n(y)}) scale(${dir} 1)">${tail}${body}${eye}</g>`
}

/** An SVG of a tank of this kind: water, light from above, substrate, plants or corals, fish. */
export function tankSceneSvg(kind: TankKind, seedText: string): string {
  const random = mulberry32(seedFrom(seedText))
  const [top, bottom] = WATER[kind]
  const marine = kind === 'marine'
  const plants = Array.from({ length: kind === 'planted' ? 26 : 12 }, () => plant(random, 40 + random() * (WIDTH - 80), marine)).join('')
  const fishes = Array.from({ length: kind === 'planted' ? 14 : 8 }, () => fish(random)).join('')
  const stones = Array.from({ length: 7 }, () => {
    const x = random() * WIDTH
    return `<ellipse cx="${n(x)}" cy="${HEIGHT - 105}" rx="${n(40 + random() * 70)}" ry="${n(25 + random() * 30)}" fill="#7d7468"/>`
  }).join('')
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${WIDTH}" height="${HEIGHT}" viewBox="0 0 ${WIDTH} ${HEIGHT}">
<defs>
  <linearGradient id="water" x1="0" y1="0" x2="0" y2="1"><stop offset="0" stop-color="${top}"/><stop offset="1" stop-color="${bottom}"/></linearGradient>
  <clipPath id="glass"><rect x="20" y="40" width="${WIDTH - 40}" height="${HEIGHT - 60}"/></clipPath>
  <linearGradient id="beam" x1="0" y1="0" x2="0" y2="1"><stop offset="0" stop-color="#fff" stop-opacity="0.35"/><stop offset="1" stop-color="#fff" stop-opacity="0"/></linearGradient>
</defs>
<rect width="${WIDTH}" height="${HEIGHT}" fill="#20262b"/>
<g clip-path="url(#glass)">
<rect x="20" y="40" width="${WIDTH - 40}" height="${HEIGHT - 60}" fill="url(#water)"/>
<polygon points="200,40 420,40 560,${HEIGHT - 100} 120,${HEIGHT - 100}" fill="url(#beam)"/>
<polygon points="700,40 880,40 1000,${HEIGHT - 100} 640,${HEIGHT - 100}" fill="url(#beam)"/>
${plants}${stones}
<rect x="20" y="${HEIGHT - 110}" width="${WIDTH - 40}" height="90" fill="${marine ? '#e9dcc0' : '#8a7556'}"/>
${fishes}
<rect x="20" y="40" width="${WIDTH - 40}" height="14" fill="#111" opacity="0.6"/>
</g>
</svg>`
}

/** The scene as PNG bytes, for the photo service (which re-encodes to JPEG like any upload). */
export async function tankScenePng(kind: TankKind, seedText: string): Promise<Buffer> {
  const sharp = (await import('sharp')).default
  return sharp(Buffer.from(tankSceneSvg(kind, seedText)))
    .png()
    .toBuffer()
}
