import QRCode from 'qrcode'

export type QrMatrix = { size: number; dark: (row: number, col: number) => boolean }

/**
 * The QR symbol of a link (ISO/IEC 18004), level M: about 15 % of it may be smudged or wet and it
 * still reads. Drawn as vector squares on labels, and as pixels by tests that decode it.
 */
export function qrMatrix(text: string): QrMatrix {
  const { modules } = QRCode.create(text, { errorCorrectionLevel: 'M' })
  return { size: modules.size, dark: (row, col) => Boolean(modules.get(row, col)) }
}

/** The link a tank's label carries: the tank's test-kit entry page. */
export const tankLabelLink = (publicUrl: string, tankId: number) => `${publicUrl.replace(/\/+$/, '')}/tanks/${tankId}/test-kit`
