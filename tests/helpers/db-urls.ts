export const TEMPLATE_DB = 'tw_test_template'

export function databaseUrl(name: string) {
  const url = new URL(process.env.DATABASE_URL!)
  url.pathname = `/${name}`
  return url.toString()
}

export const adminUrl = () => databaseUrl('postgres')
