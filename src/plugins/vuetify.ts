import '@/styles/fonts.css'
// Vuetify's base and utility classes; its material colour palette (bg-red-lighten-2, …) is left
// out: every colour the client names is a theme colour.
import 'vuetify/styles/core'
import 'vuetify/styles/utilities'
import { createVuetify, type ThemeDefinition } from 'vuetify'
import { aliases } from 'vuetify/iconsets/mdi-svg'
import { mdiSvg } from './icons'
import { initialThemeName } from '@/composables/useThemePreference'

// Tankwarden's look is defined here once: the palette, the header, the state colours and the tile.
// Tank-state colours (steady, watch, alarm, quiet, no_sensor) are theme colours so screens use
// `color="alarm"` and get the right shade for light and dark alike. Every pair of a colour and its
// `on-` colour keeps at least 4.5:1 (WCAG 2.1, 1.4.3), which tests/e2e/look.test.ts measures.

/** The tile and card shape every screen and the wall share (as `--v-tile-radius`, `--v-tile-border`). */
const TILE = { 'tile-radius': '12px', 'tile-border': '3px' }

export const tankwardenLight: ThemeDefinition = {
  dark: false,
  colors: {
    // Deep pond teal for the header: white on it reads at about 9:1.
    header: '#0E4950',
    'on-header': '#FFFFFF',
    background: '#F3F6F6',
    surface: '#FFFFFF',
    'surface-variant': '#DDE5E6',
    'on-surface-variant': '#1D2B2E',
    primary: '#11606B',
    secondary: '#3E4A61',
    error: '#B3261E',
    // A dark amber: as text it keeps 4.5:1 on white, the page and tinted panels, and it carries white.
    warning: '#8A5A00',
    success: '#2F7D5B',
    info: '#3A6EA5',
    steady: '#2F7D5B',
    watch: '#8A5A00',
    alarm: '#B3261E',
    quiet: '#5D5F86',
    no_sensor: '#5F6B6E',
  },
  variables: {
    // Labels, subtitles and hints are drawn at this share of the text colour; field labels also sit
    // inside a field at 87 %. At 0.72 the faintest of them stays above 4.5:1 on every light surface.
    'medium-emphasis-opacity': 0.72,
    ...TILE,
  },
}

// Lighter tints on dark surfaces keep the same meanings at comparable contrast.
export const tankwardenDark: ThemeDefinition = {
  dark: true,
  colors: {
    // A header a shade above the page, not a bright band across the top of a dark room.
    header: '#1B3236',
    'on-header': '#E3F1F2',
    background: '#0E1517',
    surface: '#162124',
    'surface-variant': '#2A3A3E',
    'on-surface-variant': '#DCE6E8',
    primary: '#5CB9C4',
    secondary: '#A9B6CF',
    error: '#F28B82',
    warning: '#E5AE55',
    success: '#6CC69A',
    info: '#8DB8E8',
    steady: '#6CC69A',
    watch: '#E5AE55',
    alarm: '#F28B82',
    quiet: '#A7A9DB',
    no_sensor: '#B5C0C2',
    // The light tints need dark text on top to stay legible.
    'on-primary': '#00292E',
    'on-secondary': '#161E2C',
    'on-error': '#3D0B08',
    'on-warning': '#2B1C00',
    'on-success': '#08261A',
    'on-info': '#0B2139',
    'on-steady': '#08261A',
    'on-watch': '#2B1C00',
    'on-alarm': '#3D0B08',
    'on-quiet': '#181A3A',
    'on-no_sensor': '#1B2224',
  },
  variables: { ...TILE },
}

export const vuetify = createVuetify({
  // `mdi-…` names in templates draw as SVG from the build's icon map; Vuetify's own icons ($close, …) are its SVG aliases.
  icons: { defaultSet: 'mdi', aliases, sets: { mdi: mdiSvg } },
  theme: {
    defaultTheme: initialThemeName(),
    themes: { tankwardenLight, tankwardenDark },
  },
  defaults: {
    VTextField: { variant: 'outlined', density: 'comfortable' },
    VSelect: { variant: 'outlined', density: 'comfortable' },
    VAutocomplete: { variant: 'outlined', density: 'comfortable' },
    VTextarea: { variant: 'outlined', density: 'comfortable' },
    VCard: { variant: 'flat', border: true },
    // The paperclip outside a file field is a second, nameless way to open the file picker ("CSV
    // file prepended action" to a screen reader); inside the field it is only a picture.
    VFileInput: { variant: 'outlined', density: 'comfortable', prependIcon: '', prependInnerIcon: '$file' },
  },
})
