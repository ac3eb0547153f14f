// What other features may use of photos/; everything else in the folder is its own.
export { photosInPeriod, photosService, readPhotoBytes } from './photos'
