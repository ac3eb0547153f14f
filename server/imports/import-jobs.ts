import { stat } from 'node:fs/promises'
import type { PublicImportJob, StartImportInput, ImportSourceSummary, ImportMapping } from '@shared/schemas/imports'
import { METRICS } from '@shared/metrics/registry'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { AppError, badRequest, conflict, notFound } from '../platform/errors'
import { importFiles } from './files'
import { importRunnerFor } from './runner'
import { assertCsvText, buildPreview, NotCsvError, readHead, SNIFF_BYTES, UnreadableHeaderError } from './sniff'
import type { ImportJob } from '../models'
import { canSeeSite, visibleTank } from '../access/scope'
import { perContext } from '../platform/per-context'

/** Units that need the tank's context (full-scale lux, water temperature) cannot come from a file column. */

export type UploadedFile = { key: string; originalName: string; size: number }

export const importJobsService = perContext((ctx: AppContext) => {
  const { models } = ctx
  const files = importFiles(ctx.config.dataDir)

  function present(job: ImportJob, timeZone: string): PublicImportJob {
    return {
      id: job.id,
      status: job.status,
      scope: job.tankId ? { kind: 'tank', id: job.tankId, timeZone } : { kind: 'site', id: job.siteId, timeZone },
      fileName: job.fileName,
      sizeBytes: job.sizeBytes,
      bytesRead: job.bytesRead,
      sourceName: job.source?.name ?? null,
      rowsRead: job.rowsRead,
      rowsAccepted: job.rowsAccepted,
      rowsDuplicate: job.rowsDuplicate,
      rowsRejected: job.rowsRejected,
      error: job.error,
      preview: job.preview,
      hasReport: job.hasReport,
      startedAt: job.startedAt?.toISOString() ?? null,
      finishedAt: job.finishedAt?.toISOString() ?? null,
      createdAt: job.createdAt.toISOString(),
    }
  }

  async function siteOf(actor: UserActor, siteId: number) {
    const site = await models.Site.findByPk(siteId)
    if (!canSeeSite(actor, site)) throw notFound('Site not found')
    return site!
  }

  async function find(actor: UserActor, id: number) {
    const job = await models.ImportJob.findOne({ where: { id, organizationId: actor.organizationId }, include: [{ association: 'source' }] })
    if (!job) throw notFound('Import not found')
    const site = await siteOf(actor, job.siteId).catch(() => {
      throw notFound('Import not found')
    })
    return { job, site }
  }

  async function sourceNamed(organizationId: number, name: string | undefined) {
    if (!name) return null
    return models.ImportSource.findOne({ where: { organizationId, name } })
  }

  return {
    /** Resolves the scope before any byte is accepted, so a refused scope stores nothing. */
    async scopeFor(actor: UserActor, scope: { tankId?: number; siteId?: number }) {
      if (scope.tankId) {
        const tank = await visibleTank(ctx, actor, scope.tankId)
        if (tank.archivedAt) throw badRequest('The tank is archived', { tankId: 'the tank is archived' })
        return { siteId: tank.siteId, tankId: tank.id, timeZone: tank.site?.timeZone ?? 'UTC' }
      }
      const site = await siteOf(actor, scope.siteId!)
      return { siteId: site.id, tankId: null, timeZone: site.timeZone }
    },

    /** Checks the upload's content and records it with its preview; a refused file is removed. */
    async createFromUpload(actor: UserActor, scope: { siteId: number; tankId: number | null; timeZone: string }, file: UploadedFile, sourceName?: string) {
      try {
        const { size } = await stat(files.upload(file.key))
        const head = await readHead(files.upload(file.key))
        const text = assertCsvText(head, size <= SNIFF_BYTES)
        const source = await sourceNamed(actor.organizationId, sourceName)
        const preview = buildPreview(text, size <= SNIFF_BYTES, { timeZone: scope.timeZone, siteImport: !scope.tankId, remembered: source?.mapping })
        if (preview.rows.length === 0) throw new NotCsvError('The file has a header but no data rows')
        const job = await models.ImportJob.create({
          organizationId: actor.organizationId,
          createdBy: actor.userId,
          siteId: scope.siteId,
          tankId: scope.tankId,
          sourceId: source?.id ?? null,
          fileKey: file.key,
          // Shown to people only; control characters and paths are cut so it cannot mislead.
          fileName: (file.originalName.split(/[\\/]/).pop() ?? 'upload.csv').replace(/[\u0000-\u001f\u007f]/g, '').slice(0, 200) || 'upload.csv',
          sizeBytes: size,
          preview,
          status: 'uploaded',
        })
        await job.reload({ include: [{ association: 'source' }] })
        return present(job, scope.timeZone)
      } catch (error) {
        await files.removeUpload(file.key).catch(() => undefined)
        if (error instanceof NotCsvError) throw new AppError(415, 'not_csv', error.message)
        if (error instanceof UnreadableHeaderError) throw badRequest(`file: ${error.message}`, { file: error.message })
        throw error
      }
    },

    async get(actor: UserActor, id: number) {
      const { job, site } = await find(actor, id)
      return present(job, site.timeZone)
    },

    /** Confirms the mapping, remembers it for the named source, and queues the job. */
    async start(actor: UserActor, id: number, input: StartImportInput) {
      const { job, site } = await find(actor, id)
      if (job.status !== 'uploaded') throw conflict('import_started', `This import is already ${job.status}; upload the file again to import it again`)
      const mapping = input.mapping
      const header = job.preview!.header
      const fields: Record<string, string> = {}
      const known = (path: string, column: string | undefined) => {
        if (column !== undefined && !header.includes(column)) fields[path] = `the file has no column "${column}"`
      }
      known('mapping.timeColumn', mapping.timeColumn)
      known('mapping.tankColumn', mapping.tankColumn)
      mapping.metrics.forEach((m, i) => {
        known(`mapping.metrics.${i}.column`, m.column)
        if (!(m.unit in METRICS[m.metric].units)) fields[`mapping.metrics.${i}.unit`] = `${m.metric} has no unit "${m.unit}"`
        else if (METRICS[m.metric].units[m.unit]?.needs)
          fields[`mapping.metrics.${i}.unit`] = `${m.unit} needs the tank's context; import ${METRICS[m.metric].unit} instead`
      })
      if (!job.tankId) {
        if (!mapping.tankColumn && !mapping.tankId) fields['mapping.tankColumn'] = 'a site import needs a tank column or one tank for every row'
        if (mapping.tankId) {
          const tank = await models.Tank.findOne({ where: { id: mapping.tankId, siteId: job.siteId, organizationId: actor.organizationId } })
          if (!tank) fields['mapping.tankId'] = 'no such tank at this site'
        }
      }
      if (Object.keys(fields).length) throw badRequest(`${Object.keys(fields)[0]}: ${Object.values(fields)[0]}`, fields)
      let sourceId = job.sourceId
      if (input.sourceName) {
        const remembered = rememberable(mapping)
        const existing = await sourceNamed(actor.organizationId, input.sourceName)
        const source = existing
          ? await existing.update({ mapping: remembered })
          : await models.ImportSource.create({ organizationId: actor.organizationId, name: input.sourceName, mapping: remembered })
        sourceId = source.id
      }
      const [updated] = await models.ImportJob.update({ mapping, sourceId, status: 'queued' }, { where: { id, status: 'uploaded' } })
      if (!updated) throw conflict('import_started', 'This import was started already')
      importRunnerFor(ctx).enqueue(id)
      await job.reload({ include: [{ association: 'source' }] })
      return present(job, site.timeZone)
    },

    async cancel(actor: UserActor, id: number) {
      const { job, site } = await find(actor, id)
      if (['done', 'cancelled', 'failed'].includes(job.status)) throw conflict('import_finished', `This import is already ${job.status}`)
      await importRunnerFor(ctx).cancel(id)
      if (job.status === 'uploaded') await files.removeUpload(job.fileKey)
      await job.reload({ include: [{ association: 'source' }] })
      return present(job, site.timeZone)
    },

    async reportPath(actor: UserActor, id: number) {
      const { job } = await find(actor, id)
      if (!job.hasReport) throw notFound('This import has no rejected rows')
      return { path: files.report(job.fileKey), name: `import-${job.id}-rejected.csv` }
    },

    async sources(actor: UserActor): Promise<ImportSourceSummary[]> {
      const rows = await models.ImportSource.findAll({ where: { organizationId: actor.organizationId }, order: [['updatedAt', 'DESC']] })
      return rows.map((s) => ({ id: s.id, name: s.name, mapping: s.mapping, updatedAt: s.updatedAt.toISOString() }))
    },
  }
})

/** A fixed tank of a site import belongs to that upload, not to the source. */
function rememberable(mapping: ImportMapping): ImportMapping {
  const { tankId: _tankId, ...rest } = mapping
  return rest
}
