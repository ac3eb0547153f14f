/** "1 tank", "3 tanks", "2 batches" (pass `many` where adding an s is wrong). */
export const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`
