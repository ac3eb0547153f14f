// What other features may use of equipment/; everything else in the folder is its own.
export { checkTaskConsumable, consumableAlerts, drawDown } from './consumables'
export { equipmentService, heaterAge } from './equipment'
export { consumablesService } from './consumables'
