import { initModels } from '../database/models'

/** The models, registered on the process's one Sequelize instance. */
export function useModels() {
  return initModels()
}
