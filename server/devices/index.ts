// What other features may use of devices/; everything else in the folder is its own.
export { deviceFromToken } from './device-tokens'
export { devicesService } from './devices'
