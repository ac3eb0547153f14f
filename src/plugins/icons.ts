import { h, type FunctionalComponent } from 'vue'
import type { IconProps, IconSet } from 'vuetify'
import { iconPaths } from 'virtual:mdi-icons'

const paths: Record<string, string> = iconPaths

/**
 * Draws an `mdi-…` name as an inline SVG path from the build's icon map (tooling/vite-mdi-icons.ts):
 * only the icons the client names travel, and none waits for a font. The element keeps the name as
 * a class, as the icon font did, so a test or a style can still find it.
 */
const MdiSvgIcon: FunctionalComponent<IconProps> = (props) => {
  const name = typeof props.icon === 'string' ? props.icon : ''
  return h(props.tag, { class: name }, [
    h('svg', { class: 'v-icon__svg', xmlns: 'http://www.w3.org/2000/svg', viewBox: '0 0 24 24', role: 'img', 'aria-hidden': 'true' }, [
      h('path', { d: paths[name] ?? '' }),
    ]),
  ])
}
MdiSvgIcon.props = ['tag', 'icon', 'disabled']

export const mdiSvg: IconSet = { component: MdiSvgIcon as IconSet['component'] }
