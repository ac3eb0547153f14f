import type { PublicRule } from '@shared/schemas/rules'

export interface Look {
  word: string
  icon: string
  /** Theme colour name (see plugins/vuetify). */
  color: string
}

// Word, icon shape and colour together: colour never carries the meaning alone.
export const SEVERITY_LOOKS: Record<PublicRule['severity'], Look> = {
  alarm: { word: 'Alarm', icon: 'mdi-alert-octagon', color: 'alarm' },
  warning: { word: 'Warning', icon: 'mdi-alert', color: 'watch' },
}

export const RULE_STATUS_LOOKS: Record<NonNullable<PublicRule['status']>, Look> = {
  clear: { word: 'Clear', icon: 'mdi-check-circle-outline', color: 'steady' },
  holding: { word: 'Holding — not long enough yet', icon: 'mdi-timer-sand', color: 'watch' },
  tripped: { word: 'Tripped', icon: 'mdi-bell-alert', color: 'alarm' },
}
