// Database set-up for `npm start`, `npm test` and `npm run db:*`: migrations, then demo data when empty.
import { createSequelize } from '../server/database/connection'
import { migrate } from '../server/database/migrate'
import { isEmpty, seedDemo } from '../seeders/demo'

const command = process.argv[2] ?? 'setup'
const url = process.env.DATABASE_URL
if (!url) {
  console.error('DATABASE_URL is not set.')
  process.exit(1)
}

const applied = await migrate(url)
if (applied.length) console.log(`  migrations applied: ${applied.join(', ')}`)
else console.log('  migrations: up to date')

if (command === 'setup' || command === 'seed') {
  const sequelize = createSequelize(url, 2)
  try {
    if (await isEmpty(sequelize)) {
      await seedDemo(sequelize)
      console.log('  demo data loaded')
    }
    else if (command === 'seed') {
      console.log('  the database already holds data: demo data not loaded')
    }
  }
  finally {
    await sequelize.close()
  }
}
