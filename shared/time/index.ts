// Time on a site's clock, one module for the client, the server's mails and PDFs: wall-clock
// arithmetic in a zone (zoned.ts), instants as text (format.ts), `datetime-local` values (local-input.ts),
// what is typed into date and time fields (field-text.ts).
export * from './zoned'
export * from './format'
export * from './local-input'
export * from './field-text'
