// The build report sent or downloaded: its data rendered as a PDF, and as a mail with that PDF.
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { enqueueMail } from '../mail'
import { buildReportMail, buildReportFileName } from './report-mail'
import { renderBuildReportPdf } from './report-pdf'
import { loadBuildReport } from './report-data'
import { perContext } from '../platform/per-context'

export const buildReportService = perContext((ctx: AppContext) => {
  return {
    load: (actor: UserActor, tankId: number, now = new Date()) => loadBuildReport(ctx, actor, tankId, now),

    async pdf(actor: UserActor, tankId: number, now = new Date()) {
      const report = await loadBuildReport(ctx, actor, tankId, now)
      return { pdf: await renderBuildReportPdf(report), fileName: buildReportFileName(report) }
    },

    /** Queues the report with its PDF to each address; answers how many were queued. */
    async mail(actor: UserActor, tankId: number, emails: string[], now = new Date()) {
      const report = await loadBuildReport(ctx, actor, tankId, now)
      const mail = buildReportMail(report, await renderBuildReportPdf(report))
      let queued = 0
      await ctx.sequelize.transaction(async (transaction) => {
        for (const to of [...new Set(emails.map((e) => e.toLowerCase()))]) {
          const id = await enqueueMail(
            ctx,
            {
              kind: 'report',
              to,
              ...mail,
              organizationId: actor.organizationId,
              dedupeKey: `build-report:${tankId}:${now.getTime()}:${to}`,
            },
            { transaction },
          )
          if (id !== null) queued++
        }
      })
      return { queued }
    },
  }
})
