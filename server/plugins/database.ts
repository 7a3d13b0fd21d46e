import { closeSequelize } from '../database/connection'
import { initModels } from '../database/models'

/** Registers the models at start-up and closes the pool when Nitro shuts down. */
export default defineNitroPlugin((nitro) => {
  initModels()
  nitro.hooks.hook('close', closeSequelize)
})
