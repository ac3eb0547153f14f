// Only what our charts draw, so the bundle carries a fraction of ECharts. SVG draws crisply on a
// wall TV and also works in jsdom for component tests.
import { use } from 'echarts/core'
import { LineChart, ScatterChart } from 'echarts/charts'
import { DataZoomComponent, GridComponent, LegendComponent, MarkAreaComponent, MarkLineComponent, TooltipComponent } from 'echarts/components'
import { SVGRenderer } from 'echarts/renderers'

use([LineChart, ScatterChart, GridComponent, TooltipComponent, DataZoomComponent, MarkAreaComponent, MarkLineComponent, LegendComponent, SVGRenderer])
