import { describe, expect, it } from 'vitest'
import { FARADAY_CONSTANT_F, GAS_CONSTANT_R, applyCorrection, conductivityFactor, nernstSlopeMv, phCalibration, temperatureOffset } from '@shared/calibration'

describe('nernstSlopeMv', () => {
  // CODATA 2018 (Tiesinga et al. 2021, Rev. Mod. Phys. 93, 025010): R = 8.314 462 618 J/(mol·K),
  // F = 96 485.332 12 C/mol, both exact in the 2019 SI.
  it('uses the CODATA 2018 constants', () => {
    expect(GAS_CONSTANT_R).toBe(8.314462618)
    expect(FARADAY_CONSTANT_F).toBe(96485.33212)
  })
  // RT·ln10/F: 59.16 mV at 25 °C (IUPAC Recommendations 2002, Buck et al., Pure Appl. Chem. 74(11), table of k = RT ln10/F);
  // 54.20 mV at 0 °C and 61.54 mV at 37 °C (same formula, table values from memory).
  it.each([
    [25, 59.16],
    [0, 54.2],
    [37, 61.54],
  ])('%s °C → %s mV per pH', (t, mv) => {
    expect(nernstSlopeMv(t)).toBeCloseTo(mv, 2)
  })
})

describe('phCalibration', () => {
  // Two-point bracketing method (IUPAC Recommendations 2002, Measurement of pH, Buck et al.,
  // Pure Appl. Chem. 74(11)): slope (E₁ − E₂)/(pH₂ − pH₁) against RT·ln10/F.
  it('two buffers in millivolts: slope as a percentage of the ideal, offset at pH 7', () => {
    const r = phCalibration([
      { buffer: 7.0, temperatureC: 25, millivolts: 5 },
      { buffer: 4.01, temperatureC: 25, millivolts: 170 },
    ])
    // 165 mV / 2.99 pH = 55.18 mV per pH; 55.18 / 59.16 = 93.3 %
    expect(r.slopePercent).toBeCloseTo(93.28, 1)
    expect(r.offsetMv).toBeCloseTo(5, 6)
    expect(r.slopeOk).toBe(true)
  })

  it('a probe reporting pH: the correction maps its readings in the buffers back onto them', () => {
    const r = phCalibration([
      { buffer: 7.0, temperatureC: 25, reading: 7.1 },
      { buffer: 4.01, temperatureC: 25, reading: 4.2 },
    ])
    // The probe moved 2.90 pH where the buffers differ by 2.99: 97.0 % of the ideal slope.
    expect(r.slopePercent).toBeCloseTo((2.9 / 2.99) * 100, 6)
    expect(r.offsetPh).toBeCloseTo(0.1, 6)
    expect(applyCorrection(r, 7.1)).toBeCloseTo(7.0, 9)
    expect(applyCorrection(r, 4.2)).toBeCloseTo(4.01, 9)
  })

  it('three buffers: a least-squares line through them', () => {
    const r = phCalibration([
      { buffer: 4.01, temperatureC: 25, reading: 4.01 },
      { buffer: 7.0, temperatureC: 25, reading: 7.0 },
      { buffer: 10.01, temperatureC: 25, reading: 10.01 },
    ])
    expect(r.slopePercent).toBeCloseTo(100, 9)
    expect(r.gain).toBeCloseTo(1, 9)
    expect(r.intercept).toBeCloseTo(0, 9)
  })

  it('the ideal slope at the buffers’ temperature: a perfect probe at 10 °C reads 100 %', () => {
    const s = nernstSlopeMv(10)
    const r = phCalibration([
      { buffer: 7, temperatureC: 10, millivolts: 0 },
      { buffer: 4, temperatureC: 10, millivolts: 3 * s },
    ])
    expect(r.slopePercent).toBeCloseTo(100, 9)
  })

  // A slope outside about 90–105 % asks for cleaning or a new probe (`common practice`).
  it('flags a tired probe', () => {
    const r = phCalibration([
      { buffer: 7, temperatureC: 25, millivolts: 0 },
      { buffer: 4, temperatureC: 25, millivolts: 150 },
    ])
    expect(r.slopePercent).toBeCloseTo(84.5, 1)
    expect(r.slopeOk).toBe(false)
  })

  it('refuses one buffer, equal buffers or a probe that does not respond', () => {
    expect(() => phCalibration([{ buffer: 7, temperatureC: 25, reading: 7 }])).toThrow(/two or three/)
    expect(() =>
      phCalibration([
        { buffer: 7, temperatureC: 25, reading: 7 },
        { buffer: 7, temperatureC: 25, reading: 7.1 },
      ]),
    ).toThrow(/different/)
    expect(() =>
      phCalibration([
        { buffer: 7, temperatureC: 25, reading: 7 },
        { buffer: 4, temperatureC: 25, reading: 7 },
      ]),
    ).toThrow(/does not respond/)
  })
})

describe('one-point corrections (common practice)', () => {
  it('temperature: an offset against the reference thermometer', () => {
    const c = temperatureOffset(25.3, 24.9)
    expect(c.offset).toBeCloseTo(0.4, 9)
    expect(applyCorrection(c, 26.0)).toBeCloseTo(26.4, 9)
  })
  it('conductivity: a factor from one standard solution', () => {
    const c = conductivityFactor(1413, 1350)
    expect(c.factor).toBeCloseTo(1413 / 1350, 9)
    expect(applyCorrection(c, 1350)).toBeCloseTo(1413, 9)
    expect(() => conductivityFactor(1413, 0)).toThrow(/above zero/)
  })
})
