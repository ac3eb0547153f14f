/** The page a scanned tank label opens: its test-kit entry on this installation, or null for any other code. */
export function labelTarget(text: string, origin: string): string | null {
  let url: URL
  try {
    url = new URL(text.trim())
  } catch {
    return null
  }
  if (url.origin !== origin) return null
  return /^\/tanks\/\d+\/test-kit$/.test(url.pathname) ? url.pathname : null
}

type Detected = { rawValue: string }
export type QrDetector = { detect(source: CanvasImageSource): Promise<Detected[]> }
type DetectorClass = new (options: { formats: string[] }) => QrDetector

/** The browser's own QR reader (the Barcode Detection API), where it has one and a camera can be asked for. */
export function qrDetector(): QrDetector | null {
  const Detector = (globalThis as { BarcodeDetector?: DetectorClass }).BarcodeDetector
  if (!Detector || typeof navigator === 'undefined' || !navigator.mediaDevices?.getUserMedia) return null
  try {
    return new Detector({ formats: ['qr_code'] })
  } catch {
    return null
  }
}
