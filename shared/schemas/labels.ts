import { z } from 'zod'
import { LABEL_PAPERS, LABEL_SIZES } from '../labels/sheet'

export const labelSheetQuerySchema = z.object({
  paper: z.enum(LABEL_PAPERS).default('a4'),
  size: z.enum(LABEL_SIZES).default('small'),
})
export type LabelSheetQuery = z.infer<typeof labelSheetQuerySchema>
