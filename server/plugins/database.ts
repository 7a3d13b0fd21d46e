import { closeSequelize } from '../database/connection'
import { initModels } from '../database/models'
import { stopJobs } from '../utils/jobs'

/** Registers the models at start-up; at shutdown stops the jobs, then closes the pool they use. */
export default defineNitroPlugin((nitro) => {
  initModels()
  nitro.hooks.hook('close', async () => {
    await stopJobs()
    await closeSequelize()
  })
})
