import { Router } from 'express'
import { idParamsSchema } from '@shared/schemas/common'
import { startImportSchema, uploadFieldsSchema } from '@shared/schemas/imports'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse } from '../platform/http/validate'
import { csvUpload, uploadedKey } from './upload'
import { importJobsService } from './import-jobs'

function uploadRoute(ctx: AppContext, scopeOf: (id: number) => { tankId?: number; siteId?: number }) {
  const router = Router()
  const imports = importJobsService(ctx)
  const upload = csvUpload(ctx.config.dataDir, ctx.config.imports.maxMb)
  router.post(
    '/:id/imports',
    allow('imports.write'),
    // The scope is checked before the upload is read: a refused tank or site stores nothing.
    async (req, res, next) => {
      res.locals.importScope = await imports.scopeFor(actorOf(req), scopeOf(parse(idParamsSchema, req, 'params').id))
      next()
    },
    upload,
    async (req, res) => {
      const key = uploadedKey(req.file!.filename)
      const fields = uploadFieldsSchema.safeParse(req.body ?? {})
      const sourceName = fields.success ? fields.data.sourceName : undefined
      const job = await imports.createFromUpload(
        actorOf(req),
        res.locals.importScope,
        { key, originalName: req.file!.originalname, size: req.file!.size },
        sourceName,
      )
      res.status(201).json(job)
    },
  )
  return router
}

/** Mounted under /tanks: upload a CSV for one tank. */
export const tankImportRoutes = (ctx: AppContext) => uploadRoute(ctx, (id) => ({ tankId: id }))
/** Mounted under /sites: upload a CSV for a site, rows sent to tanks by name. */
export const siteImportRoutes = (ctx: AppContext) => uploadRoute(ctx, (id) => ({ siteId: id }))

/** /imports/:id — one uploaded file: its preview and progress, start, cancel, rejection report. */
export function importsRouter(ctx: AppContext) {
  const router = Router()
  const imports = importJobsService(ctx)
  router.get('/:id', allow('imports.write'), async (req, res) => {
    res.json(await imports.get(actorOf(req), parse(idParamsSchema, req, 'params').id))
  })
  router.post('/:id/start', allow('imports.write'), async (req, res) => {
    const id = parse(idParamsSchema, req, 'params').id
    res.status(202).json(await imports.start(actorOf(req), id, parse(startImportSchema, req, 'body')))
  })
  router.post('/:id/cancel', allow('imports.write'), async (req, res) => {
    res.json(await imports.cancel(actorOf(req), parse(idParamsSchema, req, 'params').id))
  })
  router.get('/:id/rejections', allow('imports.write'), async (req, res) => {
    const { path, name } = await imports.reportPath(actorOf(req), parse(idParamsSchema, req, 'params').id)
    // The data folder is often a dot folder (.data); send refuses those unless told.
    res.download(path, name, { dotfiles: 'allow', headers: { 'Content-Type': 'text/csv; charset=utf-8' } })
  })
  return router
}

/** /import-sources — the named sources and their remembered mappings, with the upload limit. */
export function importSourcesRouter(ctx: AppContext) {
  const router = Router()
  const imports = importJobsService(ctx)
  router.get('/', allow('imports.write'), async (req, res) => {
    res.json({ maxUploadMb: ctx.config.imports.maxMb, sources: await imports.sources(actorOf(req)) })
  })
  return router
}
