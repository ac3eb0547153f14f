/** The caution heater and water-level alerts carry (the incident engine passes it in). */
export const ELECTRICAL_SAFETY_CAUTION =
  'Unplug heaters, pumps and lights before hands go in the water. A heater that was out of water must be switched off and left to cool before it is put back. Follow your local electrical codes; call a licensed electrician for wiring faults.'

/** Readings inform; they do not replace a test kit or professional advice. */
export const READINGS_ARE_AIDS =
  'Sensor readings are an aid: confirm with a test kit before dosing or changing water. For sick livestock ask an aquatic veterinarian.'
