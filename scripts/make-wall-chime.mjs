// Writes the wall's alarm chime, src/assets/wall-chime.wav: two struck tones with a soft
// decay, synthesised here so the app ships its own sound. Run: node scripts/make-wall-chime.mjs
import { writeFileSync } from 'node:fs'

const RATE = 22_050
const NOTES = [
  { hz: 880, start: 0, length: 0.7 },
  { hz: 659.25, start: 0.35, length: 1.0 },
]
const seconds = Math.max(...NOTES.map((n) => n.start + n.length))
const samples = new Float64Array(Math.ceil(seconds * RATE))
for (const note of NOTES) {
  const first = Math.floor(note.start * RATE)
  for (let i = 0; i < note.length * RATE && first + i < samples.length; i++) {
    const t = i / RATE
    const attack = Math.min(1, t / 0.005) // no click at the start
    const envelope = attack * Math.exp(-t * 4.5)
    // A fundamental with two quieter partials reads as a bell rather than a beep.
    const tone = Math.sin(2 * Math.PI * note.hz * t) + 0.35 * Math.sin(2 * Math.PI * note.hz * 2 * t) + 0.15 * Math.sin(2 * Math.PI * note.hz * 3.01 * t)
    samples[first + i] += 0.45 * envelope * tone
  }
}
const data = Buffer.alloc(samples.length * 2)
samples.forEach((v, i) => data.writeInt16LE(Math.round(Math.max(-1, Math.min(1, v)) * 32_000), i * 2))
// RIFF/WAVE header, PCM 16-bit mono.
const header = Buffer.alloc(44)
header.write('RIFF', 0)
header.writeUInt32LE(36 + data.length, 4)
header.write('WAVE', 8)
header.write('fmt ', 12)
header.writeUInt32LE(16, 16)
header.writeUInt16LE(1, 20)
header.writeUInt16LE(1, 22)
header.writeUInt32LE(RATE, 24)
header.writeUInt32LE(RATE * 2, 28)
header.writeUInt16LE(2, 32)
header.writeUInt16LE(16, 34)
header.write('data', 36)
header.writeUInt32LE(data.length, 40)
writeFileSync(new URL('../src/assets/wall-chime.wav', import.meta.url), Buffer.concat([header, data]))
console.log(`wall-chime.wav: ${seconds.toFixed(2)} s, ${(44 + data.length) / 1000} kB`)
