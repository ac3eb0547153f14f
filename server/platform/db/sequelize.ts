import { Sequelize } from 'sequelize'
import pg from 'pg'

// BIGINT counts and NUMERIC sums come back as strings by default; our ids and counts fit in a double.
pg.types.setTypeParser(pg.types.builtins.INT8, (v) => Number(v))

export function createSequelize(databaseUrl: string, options: { poolMax?: number } = {}): Sequelize {
  return new Sequelize(databaseUrl, {
    dialect: 'postgres',
    dialectModule: pg,
    logging: false,
    pool: { max: options.poolMax ?? 10, min: 0, idle: 10_000, acquire: 15_000 },
    hooks: {
      // No JIT compilation: our queries are short index lookups whose row estimates can look large
      // (a wall's trend lines), and compiling them took 100 ms or more to save a millisecond of
      // running. Set per connection, not as a startup option, which a connection pooler may refuse.
      afterConnect: async (connection) => {
        await (connection as pg.Client).query('SET jit = off')
      },
    },
    define: { underscored: true },
  })
}
