import { Router } from 'express'
import { createPassport } from './access/passport'
import { allow, authenticate, authenticateDevice } from './access/middleware'
import type { AppContext } from './context'
import { authRouter } from './people/auth-routes'
import { devicesRouter } from './devices/routes'
import { deviceCalibrationRoutes } from './calibration/routes'
import { readingsRouter } from './readings/routes'
import { seriesRoutes } from './readings/series-routes'
import { tankTestKitRoutes, testKitEntriesRouter } from './test-kit/routes'
import { rulesRouter, siteRulesRoutes, snoozesRouter, tankRulesRoutes } from './incidents/watch-rule-routes'
import { ackLinksRouter, incidentsRouter } from './incidents/routes'
import { rosterRoutes } from './roster/routes'
import { devMailRouter } from './mail/dev-mail-routes'
import { careRouter, careRoutes, siteCareRoutes } from './care/routes'
import { siteWallCredentialRoutes, wallCredentialsRouter, wallRoute } from './sites/wall-routes'
import { invitationsRouter } from './people/invitation-routes'
import { sitesRouter } from './sites/routes'
import { tanksRouter } from './tanks/routes'
import { usersRouter } from './people/user-routes'
import { organizationRouter } from './people/organization-routes'
import { photosRouter, tankPhotoRoutes } from './photos/routes'
import { reportRoutes, reportSchedulesRouter } from './reports/routes'
import { exportRoutes } from './exports/routes'
import { backupRouter } from './exports/backup-routes'
import { buildRoutes } from './builds/routes'
import { maintenanceRouter, siteMaintenanceRoutes } from './incidents/maintenance-routes'
import { setupRouter } from './setup/routes'
import { overviewRouter } from './overview/routes'
import { clientsRouter } from './clients/routes'
import { roundsRouter, visitsRouter } from './visits/routes'
import { livestockRouter } from './livestock/routes'
import { consumablesRouter, equipmentRouter, siteConsumableRoutes, tankEquipmentRoutes } from './equipment/routes'
import { siteLabelRoutes } from './labels/routes'
import { pushRouter } from './push/routes'
import { importSourcesRouter, importsRouter, siteImportRoutes, tankImportRoutes } from './imports/routes'

export const API_VERSION = '0.1.0'

/** Mounts one router per resource under /api/v1. */
export function apiRouter(ctx: AppContext) {
  const passport = createPassport(ctx.models, ctx.config.jwtSecret)
  const requireUser = authenticate(passport)
  const router = Router()

  router.get('/health', async (_req, res) => {
    await ctx.sequelize.query('SELECT 1')
    res.json({ ok: true, version: API_VERSION })
  })
  router.use('/auth', authRouter(ctx, requireUser))
  router.use('/setup', setupRouter(ctx, requireUser))
  router.use('/overview', requireUser, overviewRouter(ctx))
  router.use('/invitations', invitationsRouter(ctx))
  router.use('/users', requireUser, usersRouter(ctx))
  router.use('/organization', requireUser, organizationRouter(ctx))
  // The wall answers wall displays too, so it is mounted ahead of the people-only /sites chain.
  router.use('/sites', wallRoute(ctx, authenticate(passport, ['user-jwt', 'wall-token'])))
  router.use(
    '/sites',
    requireUser,
    sitesRouter(ctx),
    siteRulesRoutes(ctx),
    rosterRoutes(ctx),
    siteWallCredentialRoutes(ctx),
    siteCareRoutes(ctx),
    exportRoutes(ctx, 'site'),
    siteImportRoutes(ctx),
    siteMaintenanceRoutes(ctx),
    siteConsumableRoutes(ctx),
    siteLabelRoutes(ctx),
  )
  router.use('/wall-credentials', requireUser, wallCredentialsRouter(ctx))
  router.use(
    '/tanks',
    requireUser,
    tanksRouter(ctx),
    seriesRoutes(ctx),
    tankTestKitRoutes(ctx),
    tankRulesRoutes(ctx),
    careRoutes(ctx),
    tankPhotoRoutes(ctx),
    exportRoutes(ctx, 'tank'),
    tankImportRoutes(ctx),
    buildRoutes(ctx),
    tankEquipmentRoutes(ctx),
  )
  router.use('/test-kit-entries', requireUser, testKitEntriesRouter(ctx))
  router.use('/rules', requireUser, rulesRouter(ctx))
  router.use('/snoozes', requireUser, snoozesRouter(ctx))
  router.use('/maintenance-windows', requireUser, maintenanceRouter(ctx))
  router.use('/incidents', requireUser, incidentsRouter(ctx))
  // careRouter carries its full paths (/care-tasks, /water-changes, /treatment-courses, /care), so it is mounted without a prefix.
  router.use(['/care-tasks', '/water-changes', '/treatment-courses', '/care'], requireUser)
  router.use(careRouter(ctx))
  router.use('/ack-links', ackLinksRouter(ctx))
  router.use('/livestock', requireUser, livestockRouter(ctx))
  router.use('/equipment', requireUser, equipmentRouter(ctx))
  router.use('/consumables', requireUser, consumablesRouter(ctx))
  router.use('/tanks', requireUser, reportRoutes(ctx, 'tank'))
  router.use('/sites', requireUser, reportRoutes(ctx, 'site'))
  router.use('/clients', requireUser, clientsRouter(ctx), reportRoutes(ctx, 'client'))
  router.use('/visits', requireUser, visitsRouter(ctx))
  router.use('/rounds', requireUser, roundsRouter(ctx))
  router.use('/report-schedules', requireUser, reportSchedulesRouter(ctx))
  router.use('/devices', requireUser, devicesRouter(ctx), deviceCalibrationRoutes(ctx))
  router.use('/photos', requireUser, photosRouter(ctx))
  router.use('/backup', requireUser, backupRouter(ctx))
  router.use('/imports', requireUser, importsRouter(ctx))
  router.use('/import-sources', requireUser, importSourcesRouter(ctx))
  router.use('/push', requireUser, pushRouter(ctx))
  router.use('/readings', authenticateDevice(passport), readingsRouter(ctx))
  // The local fake mailbox, only where no real SMTP server is configured and never in production.
  if (!ctx.config.mail.smtpUrl && ctx.config.env !== 'production') router.use('/dev/mail', requireUser, allow('mail.dev'), devMailRouter(ctx))
  return router
}
